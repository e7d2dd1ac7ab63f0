// The check pool's document check (lib/server/check-document.ts), run here in-process: the same
// answer as parsing and checking by hand, the route's own messages for a bad body, the budget, and
// answers kept by the document's bytes.
import { describe, expect, it } from "vitest";
import { check, parsePlan } from "@/kinematics";
import { checkDocumentBytes } from "@/lib/server/check-document";
import { AppError } from "@/lib/server/errors";
import { lightPlan } from "@/bench/plans";

const encode = (value: unknown) => new TextEncoder().encode(JSON.stringify(value));

function refusal(bytes: Uint8Array, budget = 3_000_000): AppError {
  try {
    checkDocumentBytes(bytes, budget);
  } catch (err) {
    if (err instanceof AppError) return err;
    throw err;
  }
  throw new Error("the document was not refused");
}

describe("the check pool's document check", () => {
  it("answers { report, summary } as the engine's check of the parsed plan gives it", () => {
    const document = lightPlan();
    const parsed = parsePlan(document);
    if (!parsed.ok) throw new Error("the bench plan does not parse");
    const answer = JSON.parse(checkDocumentBytes(encode(document), 3_000_000).body);
    expect(answer.report).toEqual(JSON.parse(JSON.stringify(check(parsed.value))));
    expect(answer.summary.moves).toBe(document.moves.length);
  });

  it("answers the same bytes again with the same text, and a changed document with its own check", () => {
    const document = lightPlan();
    const first = checkDocumentBytes(encode(document), 3_000_000);
    expect(checkDocumentBytes(encode(document), 3_000_000).body).toBe(first.body);
    const faster = { ...document, moves: document.moves.map((m, i) => (i === 0 ? { ...m, duration: 0.05 } : m)) };
    const changed = JSON.parse(checkDocumentBytes(encode(faster), 3_000_000).body);
    expect(changed.report.moves[0].duration).toBe(0.05);
    expect(changed.report.verdict).toBe("fault");
    expect(JSON.parse(first.body).report.moves[0].duration).toBe(2);
  });

  it("refuses a bad body with the route's messages: JSON syntax, a misspelt field, NUL in a name, the budget", () => {
    expect(refusal(new TextEncoder().encode("{ not json")).code).toBe("bad_request:json");
    const misspelt = { ...lightPlan(), keepOutt: [] };
    const unknown = refusal(encode(misspelt));
    expect(unknown.code).toBe("bad_request:validation");
    expect(unknown.issues.map((i) => i.message).join(" ")).toContain('did you mean "keepOut"?');
    const nul = refusal(encode({ ...lightPlan(), keepOut: [{ name: "tray\u0000", min: [0, 0, 0], max: [1, 1, 1] }] }));
    expect(nul.code).toBe("bad_request:text");
    const budget = refusal(encode(lightPlan()), 10);
    expect(budget.code).toBe("unprocessable:check-budget");
    expect(budget.message).toContain("Nothing was checked");
  });
});
