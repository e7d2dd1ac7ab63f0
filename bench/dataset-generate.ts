/**
 * An invented demonstration dataset for the audit benchmark and the dataset tests: episodes of 450–1,100
 * frames at 30 Hz on a seven-joint arm (the last joint a prismatic gripper), smooth motion well inside
 * the limits, with defects planted on a fixed pattern so every kind occurs: a single-frame glitch, a
 * gap of dropped frames, a fast stretch (speed-over), an excursion past the travel, and a non-finite
 * value (an invalid episode). Deterministic for a seed.
 */
import { parseArm, type Arm, type Episode } from "../kinematics";

/** The invented arm the generated episodes are for. */
export const datasetArmDocument = {
  name: "Copy arm (invented)",
  controlRateHz: 500,
  cautionRatio: 0.9,
  joints: [
    { name: "base", min: -3, max: 3, maxVelocity: 3 },
    { name: "shoulder", min: -1.8, max: 1.8, maxVelocity: 3 },
    { name: "elbow", min: -2.6, max: 2.6, maxVelocity: 3 },
    { name: "wrist-pitch", min: -1.9, max: 1.9, maxVelocity: 4 },
    { name: "wrist-roll", min: -3.1, max: 3.1, maxVelocity: 4 },
    { name: "tool-roll", min: -3.1, max: 3.1, maxVelocity: 4 },
    { name: "gripper", type: "prismatic", min: 0, max: 0.045, maxVelocity: 0.1 },
  ],
};

/** The parsed arm of {@link datasetArmDocument}. */
export function datasetArm(): Arm {
  const parsed = parseArm(datasetArmDocument);
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.problems));
  return parsed.value;
}

/** What defect an episode was given (the episode's index decides, so tests can predict it). */
export type PlantedDefect = "none" | "glitch" | "gap" | "speed-over" | "range" | "invalid";

/** The defect planted in episode `index`: glitch every 7th, gap every 11th, speed-over every 13th, range every 17th, invalid every 29th. */
export function plantedDefect(index: number): PlantedDefect {
  if (index % 29 === 28) return "invalid";
  if (index % 17 === 16) return "range";
  if (index % 13 === 12) return "speed-over";
  if (index % 11 === 10) return "gap";
  if (index % 7 === 6) return "glitch";
  return "none";
}

/** mulberry32: a small deterministic generator (public-domain algorithm, common practice). */
function random(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Options for {@link generateDataset}. */
export interface GenerateOptions {
  episodes: number;
  seed?: number;
  rateHz?: number;
  minFrames?: number;
  maxFrames?: number;
}

/** Generates the episodes (ids `ep-000`, `ep-001`, …). */
export function generateDataset(options: GenerateOptions): Episode[] {
  const arm = datasetArm();
  const n = arm.joints.length;
  const rate = options.rateHz ?? 30;
  const minFrames = options.minFrames ?? 450;
  const maxFrames = options.maxFrames ?? 1100;
  const rand = random(options.seed ?? 7);
  const out: Episode[] = [];
  for (let e = 0; e < options.episodes; e++) {
    const count = minFrames + Math.floor(rand() * (maxFrames - minFrames + 1));
    const timeS = new Float64Array(count);
    const position = new Float64Array(count * n);
    // per joint: centre, amplitude and angular frequency keeping speed ≤ 0.4 × maxVelocity (A·ω ≤ 0.4·v)
    const centre = arm.joints.map((j) => 0.5 * (j.min + j.max));
    const amplitude = arm.joints.map((j) => 0.3 * (j.max - j.min) * (0.3 + 0.7 * rand()));
    const omega = arm.joints.map((j, i) => Math.min((0.4 * j.maxVelocity) / amplitude[i], 0.5 + 1.5 * rand()));
    const phase = arm.joints.map(() => rand() * 2 * Math.PI);
    for (let k = 0; k < count; k++) {
      const t = k / rate;
      timeS[k] = t;
      for (let j = 0; j < n; j++) position[k * n + j] = centre[j] + amplitude[j] * Math.sin(omega[j] * t + phase[j]);
    }
    const defect = plantedDefect(e);
    const at = 20 + Math.floor(rand() * (count - 40));
    const joint = Math.floor(rand() * (n - 1));
    const span = arm.joints[joint].max - arm.joints[joint].min;
    if (defect === "glitch") position[at * n + joint] += (rand() < 0.5 ? -1 : 1) * 0.12 * span;
    if (defect === "speed-over")
      for (let k = at; k < count; k++) position[k * n + joint] += 0.02 * span * Math.min(k - at + 1, 4);
    if (defect === "range") for (let k = at; k < at + 5; k++) position[k * n + joint] = arm.joints[joint].max + 0.01;
    if (defect === "invalid") position[at * n + joint] = Number.NaN;
    let recording = { names: arm.joints.map((j) => j.name), jointCount: n, count, timeS, position };
    if (defect === "gap") {
      // drop 3 frames after `at`
      const keep = count - 3;
      const t2 = new Float64Array(keep);
      const p2 = new Float64Array(keep * n);
      for (let k = 0, o = 0; k < count; k++) {
        if (k > at && k <= at + 3) continue;
        t2[o] = timeS[k];
        p2.set(position.subarray(k * n, k * n + n), o * n);
        o++;
      }
      recording = { ...recording, count: keep, timeS: t2, position: p2 };
    }
    out.push({ id: `ep-${String(e).padStart(3, "0")}`, recording });
  }
  return out;
}
