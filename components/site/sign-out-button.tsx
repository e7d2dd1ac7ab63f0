"use client";

import { signOut } from "next-auth/react";
import { useState } from "react";

/** Ends the session through next-auth (CSRF-checked POST) and returns to the landing page. */
export function SignOutButton() {
  const [busy, setBusy] = useState(false);
  return (
    <button
      type="button"
      disabled={busy}
      onClick={() => {
        setBusy(true);
        void signOut({ callbackUrl: "/" });
      }}
      className="text-sm font-medium text-brand-600 hover:text-brand-700 disabled:opacity-60"
    >
      {busy ? "Signing out…" : "Sign out"}
    </button>
  );
}
