import { expect } from "vitest";

/** |actual − expected| ≤ abs + rel·|expected|; the message shows both numbers. */
export function expectClose(actual: number, expected: number, abs = 1e-9, rel = 1e-9, what = ""): void {
  const tol = abs + rel * Math.abs(expected);
  const ok = Number.isFinite(actual) && Math.abs(actual - expected) <= tol;
  expect(ok, `${what} expected ${expected} ± ${tol}, got ${actual}`).toBe(true);
}

/** Element-wise {@link expectClose}. */
export function expectAllClose(
  actual: ArrayLike<number>,
  expected: ArrayLike<number>,
  abs = 1e-9,
  rel = 1e-9,
  what = "",
): void {
  expect(actual.length, `${what} length`).toBe(expected.length);
  for (let i = 0; i < expected.length; i++) expectClose(actual[i], expected[i], abs, rel, `${what}[${i}]`);
}
