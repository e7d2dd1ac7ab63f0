import { describe, expect, it } from "vitest";
import { draftKey, dropDraft, keepDraft, readDraft, type DraftStore } from "@/components/editor/draft";
import { demoPlan, pose } from "./helpers";

/** A Map behind the Storage methods the drafts use (the browser's localStorage has the same three). */
function memoryStore(): DraftStore & { map: Map<string, string> } {
  const map = new Map<string, string>();
  return {
    map,
    getItem: (k) => map.get(k) ?? null,
    setItem: (k, v) => void map.set(k, v),
    removeItem: (k) => void map.delete(k),
  };
}

const planId = "8a6f1d2e-0000-4000-8000-000000000001";

describe("local drafts of unsaved edits", () => {
  it("offers back a kept draft of the same plan and base version, parsed as a plan", () => {
    const store = memoryStore();
    const loaded = demoPlan([{ goal: pose(0.2), duration: 2 }]);
    const edited = demoPlan([{ goal: pose(0.4), duration: 1.5 }]);
    expect(keepDraft(store, planId, 3, edited, new Date("2026-12-02T07:00:00Z"))).toBe(true);
    const draft = readDraft(store, planId, 3, loaded);
    expect(draft?.plan.moves[0].duration).toBe(1.5);
    expect(draft?.plan.moves[0].goal[0]).toBe(0.4);
    expect(draft?.savedAt).toBe("2026-12-02T07:00:00.000Z");
  });

  it("never offers a draft made on another base version or another plan", () => {
    const store = memoryStore();
    const loaded = demoPlan([{ goal: pose(0.2), duration: 2 }]);
    keepDraft(store, planId, 3, demoPlan([{ goal: pose(0.4), duration: 1.5 }]));
    expect(readDraft(store, planId, 4, loaded)).toBeNull();
    expect(readDraft(store, "8a6f1d2e-0000-4000-8000-000000000002", 3, loaded)).toBeNull();
  });

  it("offers nothing when the draft equals the plan as loaded", () => {
    const store = memoryStore();
    const loaded = demoPlan([{ goal: pose(0.2), duration: 2 }]);
    keepDraft(store, planId, 1, loaded);
    expect(readDraft(store, planId, 1, loaded)).toBeNull();
  });

  it("drops a draft that no longer parses as a plan instead of loading it", () => {
    const store = memoryStore();
    const loaded = demoPlan([]);
    store.setItem(
      draftKey(planId, 2),
      JSON.stringify({ savedAt: "2026-12-02T07:00:00.000Z", plan: { format: "jointproof.plan", moves: "no" } }),
    );
    expect(readDraft(store, planId, 2, loaded)).toBeNull();
    expect(store.map.has(draftKey(planId, 2))).toBe(false);
    store.setItem(draftKey(planId, 2), "{not json");
    expect(readDraft(store, planId, 2, loaded)).toBeNull();
    expect(store.map.has(draftKey(planId, 2))).toBe(false);
  });

  it("a refused or full storage is not an error", () => {
    const full: DraftStore = {
      getItem: () => {
        throw new Error("denied");
      },
      setItem: () => {
        throw new Error("quota");
      },
      removeItem: () => {
        throw new Error("denied");
      },
    };
    const plan = demoPlan([]);
    expect(keepDraft(full, planId, 1, plan)).toBe(false);
    expect(readDraft(full, planId, 1, plan)).toBeNull();
    expect(() => dropDraft(full, planId, 1)).not.toThrow();
  });
});
