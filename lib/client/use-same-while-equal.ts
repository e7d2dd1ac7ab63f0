"use client";
import { useMemo } from "react";

/**
 * The value given, or the one returned before while the two are equal as JSON: a memo keyed by
 * content, for values rebuilt on every edit whose content often stays the same (plot markers, link
 * tints), so that memoised children (charts, the 3D view) are not drawn again for nothing.
 */
export function useSameWhileEqual<T>(value: T): T {
  const key = JSON.stringify(value);
  // keyed by content on purpose: a new value with the same content keeps the old one
  // eslint-disable-next-line react-hooks/exhaustive-deps
  return useMemo(() => value, [key]);
}
