"use client";

import { useSyncExternalStore } from "react";
import { formatDateTime, formatDateTimeUtc, formatDay, SERVER_DATE_OPTIONS } from "@/lib/shared/dates";

const noop = () => () => {};

/**
 * A date in the app's one format. The server does not know the reader's locale or time zone, so
 * the first render (server and hydration) shows UTC with the zone named; the browser then shows
 * the reader's own locale and zone.
 */
export function DateTime({
  value,
  day = false,
  className,
}: {
  value: Date | string | null | undefined;
  day?: boolean;
  className?: string;
}) {
  const inBrowser = useSyncExternalStore(
    noop,
    () => true,
    () => false,
  );
  if (value === null || value === undefined) return <span className={className}>—</span>;
  const iso = typeof value === "string" ? value : value.toISOString();
  const text = day
    ? formatDay(iso, inBrowser ? {} : SERVER_DATE_OPTIONS)
    : inBrowser
      ? formatDateTime(iso)
      : formatDateTimeUtc(iso);
  return (
    <time dateTime={iso} className={className} title={formatDateTimeUtc(iso)}>
      {text}
    </time>
  );
}
