"use client";

import Link from "next/link";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { ErrorNote } from "@/components/ui/panel";
import { postAccount } from "@/lib/client/auth";
import { verifyEmailSchema } from "@/lib/shared/schemas/auth";

type State =
  { kind: "idle" } | { kind: "pending" } | { kind: "done" } | { kind: "dead" } | { kind: "error"; message: string };

export function VerifyEmailForm({ token }: { token: string }) {
  const [state, setState] = useState<State>({ kind: "idle" });

  async function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const parsed = verifyEmailSchema.safeParse({ token });
    if (!parsed.success) {
      setState({ kind: "dead" });
      return;
    }
    setState({ kind: "pending" });
    const result = await postAccount("/api/v1/accounts/verify-email", parsed.data);
    if (result.ok) setState({ kind: "done" });
    else if (result.code === "bad_request:token" || result.fields.token) setState({ kind: "dead" });
    else setState({ kind: "error", message: result.message });
  }

  if (state.kind === "done") {
    return (
      <div role="status" className="mt-8 rounded-md border border-pass/30 bg-pass-tint px-4 py-3 text-sm text-pass">
        <p className="font-medium">Address confirmed</p>
        <p className="mt-1">
          Thank you.{" "}
          <Link href="/projects" className="font-medium underline underline-offset-2">
            Go to your projects
          </Link>
        </p>
      </div>
    );
  }

  if (state.kind === "dead") {
    return (
      <div className="mt-8">
        <ErrorNote title="This link no longer works">
          It has expired or was already used. If you confirmed your address before, there is nothing more to do.
        </ErrorNote>
      </div>
    );
  }

  return (
    <form onSubmit={onSubmit} className="mt-8 space-y-4">
      {state.kind === "error" ? <ErrorNote title="The address was not confirmed">{state.message}</ErrorNote> : null}
      <Button type="submit" variant="primary" disabled={state.kind === "pending"} className="w-full">
        {state.kind === "pending" ? "Confirming…" : "Confirm my address"}
      </Button>
    </form>
  );
}
