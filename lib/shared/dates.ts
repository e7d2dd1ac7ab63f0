/**
 * The one date format of the app: day, short month name, four-digit year and a 24-hour time,
 * through `Intl` in the reader's locale ("2 Dec 2026, 14:05" in British English). A month name
 * never reads as a day, so the date is unambiguous in every locale.
 */

export interface DateFormatOptions {
  /** BCP 47 locale; default: the runtime's (the browser's language on the client). */
  locale?: string;
  /** IANA time zone; default: the runtime's (the reader's on the client). */
  timeZone?: string;
}

/** The locale and zone a server render uses, before the browser's own are known. */
export const SERVER_DATE_OPTIONS: Readonly<Required<DateFormatOptions>> = { locale: "en-GB", timeZone: "UTC" };

const dateTimeParts: Intl.DateTimeFormatOptions = {
  day: "numeric",
  month: "short",
  year: "numeric",
  hour: "2-digit",
  minute: "2-digit",
  hourCycle: "h23",
};
const dateParts: Intl.DateTimeFormatOptions = { day: "numeric", month: "short", year: "numeric" };

function toDate(value: Date | string | number): Date | null {
  const date = value instanceof Date ? value : new Date(value);
  return Number.isNaN(date.getTime()) ? null : date;
}

function format(
  value: Date | string | number | null | undefined,
  parts: Intl.DateTimeFormatOptions,
  options: DateFormatOptions,
): string {
  if (value === null || value === undefined) return "—";
  const date = toDate(value);
  if (!date) return "—";
  return new Intl.DateTimeFormat(options.locale, { ...parts, timeZone: options.timeZone }).format(date);
}

/** A moment as "2 Dec 2026, 14:05"; "—" for a missing or unreadable value. */
export function formatDateTime(
  value: Date | string | number | null | undefined,
  options: DateFormatOptions = {},
): string {
  return format(value, dateTimeParts, options);
}

/** A day as "2 Dec 2026"; "—" for a missing or unreadable value. */
export function formatDay(value: Date | string | number | null | undefined, options: DateFormatOptions = {}): string {
  return format(value, dateParts, options);
}

/** A moment in the server's fixed format with its zone named: "2 Dec 2026, 14:05 UTC". */
export function formatDateTimeUtc(value: Date | string | number | null | undefined): string {
  const text = formatDateTime(value, SERVER_DATE_OPTIONS);
  return text === "—" ? text : `${text} UTC`;
}
