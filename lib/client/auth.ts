/**
 * Browser side of the account forms (sign-up, password reset, e-mail verification): posts a
 * body to an accounts route and reads the one error shape into per-field messages, so each form
 * shows an error next to the field it belongs to. No server imports.
 */
import type { z } from "zod";

export type AccountResult =
  | { ok: true; status: number }
  | { ok: false; status: number; code: string; message: string; fields: Record<string, string> };

/** zod issues → `{ field: message }` (first issue per top-level field; `form` for the body itself). */
export function fieldErrors(error: z.ZodError): Record<string, string> {
  const out: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = issue.path.length > 0 ? String(issue.path[0]) : "form";
    out[key] ??= issue.message;
  }
  return out;
}

export async function postAccount(path: string, body: unknown): Promise<AccountResult> {
  let res: Response;
  try {
    res = await fetch(path, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify(body),
    });
  } catch {
    return {
      ok: false,
      status: 0,
      code: "network",
      message: "The server could not be reached. Check your connection and try again.",
      fields: {},
    };
  }
  if (res.ok) return { ok: true, status: res.status };
  const data = (await res.json().catch(() => null)) as {
    error?: { code?: string; message?: string; issues?: { path: string; message: string }[] };
  } | null;
  const fields: Record<string, string> = {};
  for (const issue of data?.error?.issues ?? []) fields[issue.path.split(/[.[]/, 1)[0]] ??= issue.message;
  return {
    ok: false,
    status: res.status,
    code: data?.error?.code ?? "internal",
    message: data?.error?.message ?? "Something went wrong on the server.",
    fields,
  };
}
