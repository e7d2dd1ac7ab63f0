import { describe, expect, it } from "vitest";
import { initialSession, sessionReducer, type LoadedRecording } from "@/components/recordings/recording-session";
import { planFromRecording } from "@/components/recordings/plan-from-recording";
import { parseArm, repairStream, scanRecording, type Arm } from "@/kinematics";

function armOf(): Arm {
  const r = parseArm({
    name: "Two joints",
    controlRateHz: 1000,
    joints: [
      { name: "base", min: -3, max: 3, maxVelocity: 2, maxAcceleration: 20 },
      { name: "lift", min: -2, max: 2, maxVelocity: 2, maxAcceleration: 20 },
    ],
  });
  if (!r.ok) throw new Error("arm");
  return r.value;
}

/** 1 kHz over 2 s; `lift` jumps by 0.3 rad at 1 s (a jump fault), `base` sweeps slowly. */
function loadedWithJump(): LoadedRecording {
  const lines = ["t,base,lift"];
  for (let k = 0; k <= 2000; k++) lines.push([k / 1000, 0.2 * Math.sin(k / 1000), k >= 1000 ? 0.3 : 0].join(","));
  const scanned = scanRecording(armOf(), lines.join("\n"));
  if ("problems" in scanned) throw new Error("refused");
  return { fileName: "guided.csv", sizeBytes: 1, checkMs: 1, ...scanned };
}

describe("recordings page session", () => {
  it("shows the joint of the first fault and names the plan after the file once a recording is loaded", () => {
    const state = sessionReducer(initialSession("arm-1"), { type: "loaded", loaded: loadedWithJump() });
    expect(state.loaded?.report.verdict).toBe("fault");
    expect(state.joint).toBe(1);
    expect(state.planName).toBe("guided (repaired)");
  });

  it("drops the check, the repair and the plan preview when another arm is chosen", () => {
    const loaded = loadedWithJump();
    let state = sessionReducer(initialSession("arm-1"), { type: "loaded", loaded });
    const repaired = repairStream(armOf(), loaded.recording);
    state = sessionReducer(state, {
      type: "repaired",
      repaired: { recording: repaired.recording, report: loaded.report, maxDeviation: repaired.maxDeviation },
      planPreview: planFromRecording(armOf(), repaired.recording, 0.5),
    });
    state = sessionReducer(state, { type: "choose-arm", armId: "arm-2" });
    expect(state).toMatchObject({ armId: "arm-2", loaded: null, repaired: null, planPreview: null });
  });

  it("clears the last file's problems and results when a new file is read", () => {
    let state = sessionReducer(initialSession("arm-1"), {
      type: "refused",
      problems: ['line 4, column "t": time 0 s is not after the previous line\'s 0 s'],
    });
    state = sessionReducer(state, { type: "read-start", file: new File(["t,base\n"], "next.csv") });
    expect(state).toMatchObject({ problems: [], loaded: null, progress: 0, uploadProgress: null });
    expect(state.file?.name).toBe("next.csv");
  });
});

describe("plan from a repaired recording", () => {
  it("lengthens moves to their shortest safe duration so the plan from a repaired recording has no fault", () => {
    const loaded = loadedWithJump();
    const repaired = repairStream(armOf(), loaded.recording).recording;
    const preview = planFromRecording(armOf(), repaired, 0.25);
    expect(preview.plan.moves).toHaveLength(8);
    expect(preview.lengthened).toBeGreaterThan(0);
    expect(preview.report.verdict).not.toBe("fault");
  });
});
