/**
 * The check of a plan document from the bytes of a request body, as the check pool's workers run it
 * (lib/server/check-worker.ts): the JSON body's checks and the plan schema (lib/server/json-body.ts,
 * the same code and messages as every route's), the work budget, the engine's check, and the
 * response body as JSON text. Parsing a large document, checking it and serialising its report all
 * happen off the request thread, so the server keeps answering other requests meanwhile.
 * Imports nothing server-only.
 *
 * @module
 */
import { createHash } from "node:crypto";
import { check, checkWork, type Plan } from "@/kinematics";
import { checkPlanSchema } from "@/lib/shared/schemas/api";
import { AppError } from "./errors";
import { parseJsonBytes } from "./json-body";
import { summarize } from "./report-summary";

/**
 * The 422 for a plan whose check would take more than `budget` (path points × joints), or null
 * within it; `pathPrefix` names the document in the request (e.g. "document").
 */
export function budgetError(plan: Plan, work: number, budget: number, pathPrefix = ""): AppError | null {
  if (work <= budget) return null;
  const path = pathPrefix ? `${pathPrefix}.moves` : "moves";
  return new AppError(
    "unprocessable:check-budget",
    `This plan needs ${work.toLocaleString("en")} units of check work (path points × joints: ${plan.moves.length} moves, ` +
      `${plan.arm.joints.length} joints, ${plan.arm.controlRateHz} Hz control rate); one check may use at most ${budget.toLocaleString("en")}. ` +
      `Nothing was checked. Split it into shorter plans, or use fewer, longer moves.`,
    {
      issues: [
        {
          path,
          message: `must need at most ${budget} units of check work (path points × joints); needs ${work}`,
        },
      ],
      details: { work, budget },
    },
  );
}

/** What the check of a document gives: the response body `{ report, summary }` as JSON text. */
export interface DocumentCheck {
  body: string;
  work: number;
  elapsedMs: number;
}

/**
 * Answers by the document's bytes: the check is a pure function of the bytes and the budget, so the
 * same document checked again (a script re-checking its plan) is answered from here. Least recently
 * used first out, bounded by the text held.
 */
const answers = new Map<string, DocumentCheck>();
let answerChars = 0;
const maxAnswerChars = 64 * 1024 * 1024;
const maxAnswers = 512;

/** Parses, budgets and checks a plan document's bytes; throws the route's {@link AppError}s. */
export function checkDocumentBytes(bytes: Uint8Array, budget: number): DocumentCheck {
  const key = `${budget}:${createHash("sha256").update(bytes).digest("hex")}`;
  const known = answers.get(key);
  if (known) {
    answers.delete(key); // most recently used last
    answers.set(key, known);
    return known;
  }
  const answer = checkUncached(bytes, budget);
  answers.set(key, answer);
  answerChars += answer.body.length;
  while (answers.size > maxAnswers || answerChars > maxAnswerChars) {
    const [oldest, dropped] = answers.entries().next().value as [string, DocumentCheck];
    answers.delete(oldest);
    answerChars -= dropped.body.length;
  }
  return answer;
}

function checkUncached(bytes: Uint8Array, budget: number): DocumentCheck {
  const t0 = performance.now();
  const plan = parseJsonBytes(bytes, checkPlanSchema);
  const work = checkWork(plan);
  const refused = budgetError(plan, work, budget);
  if (refused) throw refused;
  const report = check(plan);
  return {
    body: JSON.stringify({ report, summary: summarize(plan, report) }),
    work,
    elapsedMs: performance.now() - t0,
  };
}
