/**
 * A local draft of a saved plan's unsaved edits, kept in the browser's localStorage so a reload, a
 * back button or a closed tab loses nothing. One draft per plan and base version: a draft made on
 * version 3 is never offered over version 4. A draft is read back through the engine's plan parser
 * (localStorage is outside input like any other), and dropped when it no longer parses.
 */
import { z } from "zod";
import { parsePlan } from "@/kinematics";
import type { BenchPlan } from "./plan-state";

/** The storage the drafts live in (window.localStorage in the browser). */
export type DraftStore = Pick<Storage, "getItem" | "setItem" | "removeItem">;

/** A draft read back: the plan and when it was kept. */
export interface Draft {
  plan: BenchPlan;
  savedAt: string;
}

const storedDraft = z.object({ savedAt: z.string().datetime(), plan: z.unknown() });

/** The storage key of a plan's draft on a base version. */
export function draftKey(planId: string, baseVersion: number): string {
  return `jointproof.draft.${planId}.v${baseVersion}`;
}

/** Keeps the plan as the draft of (planId, baseVersion); a full or refused storage is not an error. */
export function keepDraft(
  store: DraftStore,
  planId: string,
  baseVersion: number,
  plan: BenchPlan,
  now = new Date(),
): boolean {
  try {
    store.setItem(draftKey(planId, baseVersion), JSON.stringify({ savedAt: now.toISOString(), plan }));
    return true;
  } catch {
    return false;
  }
}

/** Removes the draft of (planId, baseVersion). */
export function dropDraft(store: DraftStore, planId: string, baseVersion: number): void {
  try {
    store.removeItem(draftKey(planId, baseVersion));
  } catch {
    // storage refused: nothing was kept either
  }
}

/**
 * The draft of (planId, baseVersion), when there is one that parses as a plan and differs from the
 * plan as loaded; a draft that does not parse is removed.
 */
export function readDraft(store: DraftStore, planId: string, baseVersion: number, loaded: BenchPlan): Draft | null {
  let raw: string | null;
  try {
    raw = store.getItem(draftKey(planId, baseVersion));
  } catch {
    return null;
  }
  if (raw === null) return null;
  let json: unknown;
  try {
    json = JSON.parse(raw);
  } catch {
    dropDraft(store, planId, baseVersion);
    return null;
  }
  const stored = storedDraft.safeParse(json);
  const plan = stored.success ? parsePlan(stored.data.plan) : null;
  if (!stored.success || !plan || !plan.ok) {
    dropDraft(store, planId, baseVersion);
    return null;
  }
  if (JSON.stringify(plan.value) === JSON.stringify(loaded)) return null;
  return { plan: plan.value as BenchPlan, savedAt: stored.data.savedAt };
}
