// @vitest-environment happy-dom
// The plots' value axis and the bench's keep-by-content memo. niceAxis: steps of 1, 2, 2.5 or 5 times a
// power of ten (the usual "nice numbers" of chart axes: common practice, as in d3-scale's ticks); the
// axis must hold every trace and limit line, or a peak past a limit would be drawn off the chart.
import { renderHook } from "@testing-library/react";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { niceAxis } from "@/components/plots/joint-plots";
import { useSameWhileEqual } from "@/lib/client/use-same-while-equal";

describe("niceAxis", () => {
  it("gives nice ticks for a speed limit of ±180 °/s", () => {
    expect(niceAxis(-180, 180, 4)).toEqual({ domain: [-200, 200], ticks: [-200, 0, 200] });
    expect(niceAxis(0, 2.6, 4)).toEqual({ domain: [0, 3], ticks: [0, 1, 2, 3] });
  });

  it("holds every value between lo and hi, with evenly spaced nice ticks, for any span", () => {
    fc.assert(
      fc.property(
        fc.double({ min: -1e6, max: 1e6, noNaN: true }),
        fc.double({ min: 1e-6, max: 1e6, noNaN: true }),
        (lo, span) => {
          const hi = lo + span;
          const { domain, ticks } = niceAxis(lo, hi, 4);
          expect(domain[0]).toBeLessThanOrEqual(lo);
          expect(domain[1]).toBeGreaterThanOrEqual(hi);
          expect(ticks[0]).toBe(domain[0]);
          expect(ticks[ticks.length - 1]).toBe(domain[1]);
          expect(ticks.length).toBeGreaterThanOrEqual(2);
          expect(ticks.length).toBeLessThanOrEqual(12);
          const step = ticks[1] - ticks[0];
          const mantissa = step / 10 ** Math.floor(Math.log10(step));
          expect([1, 2, 2.5, 5, 10].some((m) => Math.abs(m - mantissa) < 1e-3)).toBe(true);
        },
      ),
      { numRuns: 500 },
    );
  });

  it("still draws an axis for a flat trace (all zero, or a constant)", () => {
    expect(niceAxis(0, 0, 4).ticks.length).toBeGreaterThanOrEqual(2);
    const { domain } = niceAxis(3, 3, 4);
    expect(domain[0]).toBeLessThan(3);
    expect(domain[1]).toBeGreaterThan(3);
  });
});

describe("useSameWhileEqual", () => {
  it("keeps the first value while the content is equal, and takes a new content at once", () => {
    const first = [{ a: 1 }];
    const { result, rerender } = renderHook(({ v }) => useSameWhileEqual(v), { initialProps: { v: first } });
    expect(result.current).toBe(first);
    rerender({ v: [{ a: 1 }] });
    expect(result.current).toBe(first);
    const changed = [{ a: 2 }];
    rerender({ v: changed });
    expect(result.current).toBe(changed);
  });
});
