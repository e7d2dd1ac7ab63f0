/** A field-by-field difference of two JSON documents (two plan versions). */
import { formatPath } from "@/kinematics";

export type Change = { path: string; change: "added" | "removed" | "changed"; from?: unknown; to?: unknown };

function isObject(v: unknown): v is Record<string, unknown> {
  return typeof v === "object" && v !== null && !Array.isArray(v);
}

/** Every leaf that differs, in document order; arrays compared index by index. */
export function diffDocuments(
  from: unknown,
  to: unknown,
  path: (string | number)[] = [],
  out: Change[] = [],
): Change[] {
  if (Array.isArray(from) && Array.isArray(to)) {
    const n = Math.max(from.length, to.length);
    for (let i = 0; i < n; i++) {
      if (i >= to.length) out.push({ path: formatPath([...path, i]), change: "removed", from: from[i] });
      else if (i >= from.length) out.push({ path: formatPath([...path, i]), change: "added", to: to[i] });
      else diffDocuments(from[i], to[i], [...path, i], out);
    }
    return out;
  }
  if (isObject(from) && isObject(to)) {
    const keys = [...new Set([...Object.keys(from), ...Object.keys(to)])];
    for (const key of keys) {
      if (!(key in to)) out.push({ path: formatPath([...path, key]), change: "removed", from: from[key] });
      else if (!(key in from)) out.push({ path: formatPath([...path, key]), change: "added", to: to[key] });
      else diffDocuments(from[key], to[key], [...path, key], out);
    }
    return out;
  }
  if (!Object.is(from, to)) out.push({ path: formatPath(path), change: "changed", from, to });
  return out;
}
