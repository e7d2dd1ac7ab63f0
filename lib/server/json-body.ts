/**
 * A JSON body from its bytes to a validated value, without the framework: UTF-8 without a
 * byte-order mark, nesting depth, JSON syntax, clean text (no NUL, no lone surrogate), then the zod
 * schema, each failure an {@link AppError} with the field named. Imports nothing server-only, so the
 * check pool's worker threads run the same code on the documents they parse (lib/server/check-worker.ts).
 *
 * @module
 */
import { z } from "zod";
import { formatPath, unknownFieldProblems } from "@/kinematics";
import { AppError, type Issue } from "./errors";

/** zod issues as `{ path, message }`, the path prefixed (e.g. `query.rateHz`, `document.start`). */
export function toIssues(error: z.ZodError, prefix: PropertyKey[] = []): Issue[] {
  return error.issues.flatMap((i) =>
    // An unknown key is named by its own path (and the field it was probably meant to be), as the CLI names it.
    i.code === "unrecognized_keys"
      ? unknownFieldProblems(i).map((p) => ({ path: formatPath([...prefix, ...p.path], "(body)"), message: p.message }))
      : [{ path: formatPath([...prefix, ...i.path], "(body)"), message: i.message }],
  );
}

export function parseOrThrow<S extends z.ZodType>(
  schema: S,
  value: unknown,
  prefix: PropertyKey[],
  what: string,
): z.infer<S> {
  const result = schema.safeParse(value);
  if (!result.success) {
    throw new AppError("bad_request:validation", `The ${what} is not valid.`, {
      issues: toIssues(result.error, prefix),
    });
  }
  return result.data;
}

/** Deepest object/array nesting a JSON body may have; every document of ours is far shallower. */
export const MAX_JSON_DEPTH = 64;

/** Refuses deeply nested JSON by counting brackets outside strings, before parsing it. */
function assertNestingDepth(text: string): void {
  let depth = 0;
  let inString = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (inString) {
      if (c === 0x5c)
        i++; // backslash: skip the escaped character
      else if (c === 0x22) inString = false;
    } else if (c === 0x22) inString = true;
    else if (c === 0x7b || c === 0x5b) {
      if (++depth > MAX_JSON_DEPTH) {
        throw new AppError("bad_request:json", `The body is nested more than ${MAX_JSON_DEPTH} levels deep.`, {
          issues: [{ path: "(body)", message: `must be nested at most ${MAX_JSON_DEPTH} levels deep` }],
        });
      }
    } else if (c === 0x7d || c === 0x5d) depth--;
  }
}

/** A NUL character, or a UTF-16 surrogate without its partner (not a Unicode scalar value). */
const BAD_TEXT = /\u0000|[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

/** Why a string is refused, or null when it is clean text. */
export function textProblem(value: string): string | null {
  const m = BAD_TEXT.exec(value);
  if (!m) return null;
  return m[0] === "\u0000"
    ? "must not contain NUL characters"
    : "must not contain unpaired surrogates (not valid Unicode text)";
}

/**
 * Refuses (400, naming the field) any string or key in a parsed body or query that holds a NUL
 * character or a lone surrogate: PostgreSQL text cannot store NUL, and lone surrogates are not
 * text. Walks iteratively, so the depth of the value costs no stack.
 */
export function assertCleanText(value: unknown, prefix: PropertyKey[]): void {
  const stack: { v: unknown; path: PropertyKey[] }[] = [{ v: value, path: prefix }];
  while (stack.length > 0) {
    const { v, path } = stack.pop()!;
    if (typeof v === "string") {
      const problem = textProblem(v);
      if (problem) throw badText(path, problem);
    } else if (Array.isArray(v)) {
      for (let i = v.length - 1; i >= 0; i--) stack.push({ v: v[i], path: [...path, i] });
    } else if (v !== null && typeof v === "object") {
      for (const [key, inner] of Object.entries(v)) {
        const problem = textProblem(key);
        if (problem) throw badText([...path, "(key)"], problem);
        stack.push({ v: inner, path: [...path, key] });
      }
    }
  }
}

function badText(path: PropertyKey[], message: string): AppError {
  const field = formatPath(path, "(body)");
  return new AppError("bad_request:text", `The field ${field} ${message}.`, { issues: [{ path: field, message }] });
}

/**
 * Parses a JSON body's bytes and validates it with `schema` (the body of {@link readJson} after its
 * content type and size checks).
 */
export function parseJsonBytes<S extends z.ZodType>(bytes: Uint8Array, schema: S): z.infer<S> {
  // RFC 8259 §8.1: JSON text must not start with a byte-order mark. TextDecoder would drop it
  // silently, so it is refused here, the same way on every route.
  if (bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) {
    throw new AppError("bad_request:json", "The body starts with a byte-order mark; send UTF-8 JSON without one.", {
      issues: [{ path: "(body)", message: "must not start with a byte-order mark" }],
    });
  }
  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true, ignoreBOM: true }).decode(bytes);
  } catch {
    throw new AppError("bad_request:json", "The body is not UTF-8 text; send the JSON encoded as UTF-8.", {
      issues: [{ path: "(body)", message: "must be UTF-8 text" }],
    });
  }
  assertNestingDepth(text);
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch {
    throw new AppError(
      "bad_request:json",
      "The body is not valid JSON; check it with a JSON parser and send it again.",
      {
        issues: [{ path: "(body)", message: "must be valid JSON" }],
      },
    );
  }
  assertCleanText(value, []);
  return parseOrThrow(schema, value, [], "request body");
}
