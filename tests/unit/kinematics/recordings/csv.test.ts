import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { parseRecordingCsv } from "@/kinematics/recordings/csv";

const encode = (text: string) => new TextEncoder().encode(text);

describe("recording CSV parser", () => {
  it("reads the header names and the values into strided arrays", () => {
    const result = parseRecordingCsv(encode("t,base,elbow\n0,0.5,-1\n0.001,0.5005,-0.999\n"));
    expect(result.problems).toEqual([]);
    expect(result.recording).toMatchObject({ names: ["base", "elbow"], jointCount: 2, count: 2 });
    expect(Array.from(result.recording!.timeS)).toEqual([0, 0.001]);
    expect(Array.from(result.recording!.position)).toEqual([0.5, -1, 0.5005, -0.999]);
  });

  it("accepts CRLF line ends, spaces around values, signs, exponents, a byte-order mark and trailing blank lines", () => {
    const result = parseRecordingCsv(encode("\uFEFFt, a\r\n 1.5e-3 , +2.5E+1\r\n2,-.5\r\n\r\n\n"));
    expect(result.problems).toEqual([]);
    expect(Array.from(result.recording!.timeS)).toEqual([0.0015, 2]);
    expect(Array.from(result.recording!.position)).toEqual([25, -0.5]);
  });

  it("parses every double exactly as Number() does (round trip of the shortest decimal form)", () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ noNaN: true, noDefaultInfinity: true }), { minLength: 1, maxLength: 50 }),
        (values) => {
          const text = "t,q\n" + values.map((v, k) => `${k},${String(v)}`).join("\n") + "\n";
          const result = parseRecordingCsv(encode(text));
          expect(result.problems).toEqual([]);
          expect(Array.from(result.recording!.position)).toEqual(values.map((v) => Number(String(v))));
        },
      ),
      { numRuns: 300 },
    );
  });

  it("parses full-precision joint values (16–17 digits) and mantissas around 2^53 exactly as Number() does", () => {
    // the fast path takes mantissas below 2^53; both sides of that edge, with any exponent it accepts or refuses
    const aroundEdge = fc.tuple(
      fc.bigInt({ min: 2n ** 53n - 2000n, max: 2n ** 53n + 2000n }),
      fc.integer({ min: -30, max: 30 }),
      fc.boolean(),
    );
    const jointValue = fc.double({ min: -4, max: 4, noNaN: true });
    fc.assert(
      fc.property(aroundEdge, jointValue, ([m, e, neg], v) => {
        const a = `${neg ? "-" : ""}${m}e${e}`;
        const b = String(v);
        const c = `${neg ? "-" : ""}0.${m}`;
        const result = parseRecordingCsv(encode(`t,a,b,c\n0,${a},${b},${c}\n`));
        expect(result.problems).toEqual([]);
        expect(Array.from(result.recording!.position)).toEqual([Number(a), Number(b), Number(c)]);
      }),
      { numRuns: 500 },
    );
  });

  it("parses fixed-point decimals exactly as Number() does", () => {
    fc.assert(
      fc.property(fc.integer({ min: -99999999, max: 99999999 }), fc.integer({ min: 0, max: 12 }), (digits, scale) => {
        const text = (digits / 10 ** scale).toFixed(scale);
        const result = parseRecordingCsv(encode(`t,q\n0,${text}\n`));
        expect(result.recording!.position[0]).toBe(Number(text));
      }),
      { numRuns: 300 },
    );
  });

  it("refuses a header that does not start with t", () => {
    const result = parseRecordingCsv(encode("time,a\n0,1\n"));
    expect(result.recording).toBeNull();
    expect(result.problems[0]).toMatchObject({ line: 1 });
  });

  it("refuses empty fields and a blank line inside the data", () => {
    const result = parseRecordingCsv(encode("t,a\n0,\n\n0.002,1\n"));
    expect(result.problems.map((p) => [p.line, p.message])).toEqual([
      [2, "not a number (empty)"],
      [3, "blank line inside the data (blank lines are allowed only at the end)"],
    ]);
  });

  it("grows its buffers when the first line underestimates the row count", () => {
    const rows = ["0,1"];
    for (let k = 1; k < 500; k++) rows.push(`${k}.123456789,${k * 1.000001}`);
    const result = parseRecordingCsv(encode("t,a\n" + rows.join("\n")));
    expect(result.recording!.count).toBe(500);
    expect(result.recording!.position[499]).toBe(499 * 1.000001);
  });

  it("caps the list of problems and counts the rest", () => {
    const text = "t,a\n" + Array.from({ length: 30 }, (_, k) => `${k},x`).join("\n");
    const result = parseRecordingCsv(encode(text), { maxProblems: 5 });
    expect(result.problems).toHaveLength(6);
    expect(result.problems[5].message).toBe("and 25 more problems");
  });
});
