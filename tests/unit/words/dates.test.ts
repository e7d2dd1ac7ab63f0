import { describe, expect, it } from "vitest";
import { formatDateTime, formatDateTimeUtc, formatDay } from "@/lib/shared/dates";

// The format the issue asks for, "2 Dec 2026, 14:05", is British English day-month-year with a
// 24-hour clock (CLDR's en-GB medium date with a short time: common practice, no other source).
describe("one date format through Intl", () => {
  const moment = "2026-12-02T14:05:00.000Z";

  it("formats a moment as day, short month, year and 24-hour time in British English", () => {
    expect(formatDateTime(moment, { locale: "en-GB", timeZone: "UTC" })).toBe("2 Dec 2026, 14:05");
  });

  it("shows the reader's time zone, not UTC, when one is given", () => {
    expect(formatDateTime(moment, { locale: "en-GB", timeZone: "Europe/Berlin" })).toBe("2 Dec 2026, 15:05");
  });

  it("keeps a month name in other locales, so day and month cannot be swapped", () => {
    const us = formatDateTime(moment, { locale: "en-US", timeZone: "UTC" });
    expect(us).toContain("Dec");
    expect(us).toContain("2026");
    expect(us).toMatch(/14:05/);
  });

  it("names the zone in the server's fixed format", () => {
    expect(formatDateTimeUtc(new Date(moment))).toBe("2 Dec 2026, 14:05 UTC");
  });

  it("formats a day without a time", () => {
    expect(formatDay(moment, { locale: "en-GB", timeZone: "UTC" })).toBe("2 Dec 2026");
  });

  it("shows a dash for a missing or unreadable date instead of 'Invalid Date'", () => {
    expect(formatDateTime(null)).toBe("—");
    expect(formatDateTime("not a date")).toBe("—");
    expect(formatDay(undefined)).toBe("—");
  });
});
