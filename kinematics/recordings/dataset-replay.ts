/**
 * The replay of an episode on the arm, in three parts that join at rest:
 *
 * 1. ease in: one quintic move from a rest pose to the episode's first frame, over the shortest duration
 *    at which it passes the check (within the caution ratio of every timing limit; a plan, checked);
 * 2. pass through: the frames joined by one continuous curve that reaches every frame at its recorded
 *    time without stopping between them — a monotone piecewise cubic (Hermite) through the frames,
 *    at rest at the first and the last frame;
 * 3. ease out: one quintic move from the last frame back to rest (a plan, checked).
 *
 * The plan document's shapes all start and end at rest, so the pass-through part cannot be written as
 * plan moves without stopping at every frame; it is checked here, exactly per segment, for travel,
 * speed and acceleration. Its peak speed in a segment is at least the segment's mean speed Δq/Δt
 * (mean value theorem), so it never passes where the timed-replay audit finds a speed-over. Effort,
 * clearance and tool speed need the arm's chain and are not checked along the pass-through part: for
 * an arm with a chain the replay is reported as not checked fully and never as a pass.
 *
 * @module
 */
import type { Arm, Joint } from "../plan/arm";
import { homePose } from "../plan/arm";
import { planFormat, planVersion, type Move, type Plan } from "../plan/document";
import { check } from "../check/check";
import { shortestSafeDurations } from "../motion/sequence";
import { severityOf, verdictOf, type Report, type Severity, type Verdict } from "../check/report";
import { formatNumber, formatQuantity, jointLabel } from "../check/wording";
import type { Recording } from "./recording";

/** One finding along the pass-through part of a replay. */
export interface PassThroughFinding {
  kind: "range" | "speed-over" | "accel-over";
  severity: Severity;
  /** 0-based joint index. */
  joint: number;
  /** 0-based frame that ends the worst segment (the segment runs from `sample − 1` to `sample`). */
  sample: number;
  /** Segments of this joint with a finding of this kind. */
  segments: number;
  /** Time of `sample` from the episode's first frame, s. */
  timeS: number;
  /** Worst value: position (rad or m), speed (rad/s or m/s) or acceleration (rad/s² or m/s²). */
  value: number;
  /** The limit compared with, same unit as `value`. */
  limit: number;
  message: string;
}

/** The check of the pass-through part. */
export interface PassThroughCheck {
  /** Speed of each joint at each frame (rad/s or m/s), stride = joint count; 0 at the first and last frame. */
  speeds: Float64Array;
  findings: PassThroughFinding[];
  /** Verdict over what was checked (travel, speed, acceleration). */
  verdict: Verdict;
  /** What was not checked along this part, one line each; empty when nothing the arm limits was left out. */
  notChecked: string[];
}

/** The overall verdict of a replay: a check verdict, or `incomplete` when a part could not be checked fully. */
export type ReplayVerdict = Verdict | "incomplete";

/** Result of {@link replayOf}. */
export interface EpisodeReplay {
  /** The rest pose the replay starts and ends at. */
  rest: number[];
  /** Rest to the first frame (one quintic move) and its report. */
  easeIn: Plan;
  easeInReport: Report;
  /** The last frame to rest (one quintic move) and its report. */
  easeOut: Plan;
  easeOutReport: Report;
  /** Durations (s) of the ease-in and ease-out moves. */
  easeInS: number;
  easeOutS: number;
  /** The pass-through part's check. */
  passThrough: PassThroughCheck;
  /** `fault` if any part faults; else `incomplete` if something was not checked; else caution or pass. */
  verdict: ReplayVerdict;
}

/** Rounds a duration up to whole milliseconds (never shorter than the shortest safe one). */
function upToMs(durationS: number): number {
  return Math.ceil(durationS * 1000 - 1e-9) / 1000;
}

function onePlan(arm: Arm, from: number[], to: number[], durationS: number): Plan {
  const moves: Move[] = [{ goal: [...to], duration: durationS, shape: "quintic" }];
  return { format: planFormat, version: planVersion, arm, start: [...from], moves } as Plan;
}

/**
 * The shortest passing duration of one quintic move from `from` to `to`: every timing check within
 * cautionRatio × its limit, so the move is a pass rather than a caution (at least 0.1 s; 1 s when no
 * duration fixes it, and the check then says why).
 */
function easeDuration(arm: Arm, from: number[], to: number[]): number {
  const shortest = shortestSafeDurations(onePlan(arm, from, to, 1), { limitScale: arm.cautionRatio })[0];
  return Math.max(0.1, upToMs(shortest !== null && Number.isFinite(shortest) ? shortest : 1));
}

/**
 * The speed of each joint at each frame of a monotone piecewise cubic through the frames: the weighted
 * harmonic mean of the two neighbouring secants where they have the same sign, 0 where they do not or
 * one is 0 (F. N. Fritsch and J. Butland, "A method for constructing local monotone piecewise cubic
 * interpolants", SIAM J. Sci. Stat. Comput. 5(2), 1984, eq. 5 — memory), and 0 at the first and last
 * frame (the replay joins the ease moves at rest). Written into `out` (stride = joint count).
 */
export function passThroughSpeeds(recording: Recording, out: Float64Array): Float64Array {
  const { count, jointCount: n, timeS, position } = recording;
  out.fill(0);
  for (let k = 1; k < count - 1; k++) {
    const h0 = timeS[k] - timeS[k - 1];
    const h1 = timeS[k + 1] - timeS[k];
    const w1 = 2 * h1 + h0;
    const w2 = h1 + 2 * h0;
    for (let j = 0; j < n; j++) {
      const d0 = (position[k * n + j] - position[(k - 1) * n + j]) / h0;
      const d1 = (position[(k + 1) * n + j] - position[k * n + j]) / h1;
      out[k * n + j] = d0 * d1 > 0 ? (w1 + w2) / (w1 / d0 + w2 / d1) : 0;
    }
  }
  return out;
}

/** A finding being gathered for one joint and kind: worst value, its segment and how many segments. */
interface Worst {
  severity: Severity | null;
  value: number;
  sample: number;
  segments: number;
}

const fresh = (): Worst => ({ severity: null, value: 0, sample: -1, segments: 0 });

function note(w: Worst, severity: Severity | null, value: number, sample: number, worse: boolean): void {
  if (severity === null) return;
  w.segments++;
  if (w.sample < 0 || worse) {
    w.value = value;
    w.sample = sample;
  }
  if (severity === "fault" || w.severity === null) w.severity = severity;
}

/**
 * Checks the pass-through part of a valid recording (columns in the arm's joint order): on each segment
 * the cubic Hermite q(s) = q₀ + h·(m₀s + ½a₁s² + ⅓a₂s³), s ∈ [0, 1], with speed q′ = a₀ + a₁s + a₂s²
 * (a₀ = m₀, a₁ = 6δ − 4m₀ − 2m₁, a₂ = 3m₀ + 3m₁ − 6δ, δ = Δq/h) and acceleration q″ = (a₁ + 2a₂s)/h
 * (derived from the Hermite basis, de Boor, A Practical Guide to Splines, ch. IV — memory). Peak speed:
 * the ends or the vertex −a₁/(2a₂); peak acceleration: the ends (q″ is linear); travel: the frames and
 * the roots of q′ inside the segment. One finding per joint and kind, at its worst segment.
 */
export function checkPassThrough(arm: Arm, recording: Recording): PassThroughCheck {
  const { count, jointCount: n, timeS, position } = recording;
  const speeds = passThroughSpeeds(recording, new Float64Array(count * n));
  const findings: PassThroughFinding[] = [];
  const ratio = arm.cautionRatio;
  for (let j = 0; j < n; j++) {
    const joint = arm.joints[j];
    const range = fresh();
    let rangeDepth = 0;
    const speed = fresh();
    const accel = fresh();
    const noteRange = (q: number, sample: number) => {
      const depth = q < joint.min ? joint.min - q : q > joint.max ? q - joint.max : 0;
      if (depth <= 0) return;
      note(range, "fault", q, sample, depth > rangeDepth);
      if (depth > rangeDepth) rangeDepth = depth;
    };
    noteRange(position[j], 0);
    for (let k = 1; k < count; k++) {
      const h = timeS[k] - timeS[k - 1];
      const q0 = position[(k - 1) * n + j];
      const q1 = position[k * n + j];
      const m0 = speeds[(k - 1) * n + j];
      const m1 = speeds[k * n + j];
      const delta = (q1 - q0) / h;
      const a0 = m0;
      const a1 = 6 * delta - 4 * m0 - 2 * m1;
      const a2 = 3 * m0 + 3 * m1 - 6 * delta;
      // peak speed on [0, 1]: the ends, or the vertex of the quadratic when it lies inside
      let peak = Math.max(Math.abs(m0), Math.abs(m1));
      if (a2 !== 0) {
        const s = -a1 / (2 * a2);
        if (s > 0 && s < 1) peak = Math.max(peak, Math.abs(a0 + s * (a1 + s * a2)));
      }
      note(speed, severityOf(peak, joint.maxVelocity, ratio), peak, k, peak > speed.value);
      if (joint.maxAcceleration !== undefined) {
        const acc = Math.max(Math.abs(a1), Math.abs(a1 + 2 * a2)) / h;
        note(accel, severityOf(acc, joint.maxAcceleration, ratio), acc, k, acc > accel.value);
      }
      // travel: the frame, and any turning point of q inside the segment (roots of q′)
      noteRange(q1, k);
      const at = (s: number) => q0 + h * s * (a0 + s * (a1 / 2 + (s * a2) / 3));
      if (a2 === 0) {
        if (a1 !== 0) {
          const s = -a0 / a1;
          if (s > 0 && s < 1) noteRange(at(s), k);
        }
      } else {
        const disc = a1 * a1 - 4 * a2 * a0;
        if (disc >= 0) {
          const root = Math.sqrt(disc);
          for (const s of [(-a1 - root) / (2 * a2), (-a1 + root) / (2 * a2)]) if (s > 0 && s < 1) noteRange(at(s), k);
        }
      }
    }
    const push = (kind: PassThroughFinding["kind"], w: Worst, limit: number) => {
      if (w.severity === null) return;
      findings.push({
        kind,
        severity: w.severity,
        joint: j,
        sample: w.sample,
        segments: w.segments,
        timeS: timeS[w.sample] - timeS[0],
        value: w.value,
        limit,
        message: passThroughMessage(kind, joint, w, limit, timeS[w.sample] - timeS[0]),
      });
    };
    push("range", range, range.value > joint.max ? joint.max : joint.min);
    push("speed-over", speed, joint.maxVelocity);
    if (joint.maxAcceleration !== undefined) push("accel-over", accel, joint.maxAcceleration);
  }
  findings.sort((a, b) => a.sample - b.sample || a.joint - b.joint);
  const notChecked = arm.chain
    ? [
        "Effort (torque and force) along the pass-through part: not checked.",
        "Clearance from the work surface and keep-out zones along the pass-through part: not checked.",
      ]
    : [];
  return { speeds, findings, verdict: verdictOf(findings), notChecked };
}

function passThroughMessage(
  kind: PassThroughFinding["kind"],
  joint: Joint,
  w: Worst,
  limit: number,
  timeS: number,
): string {
  const label = jointLabel(joint);
  const where = `${label[0].toUpperCase()}${label.slice(1)}, frames ${w.sample}–${w.sample + 1} (t = ${formatNumber(timeS)} s)`;
  const more = w.segments > 1 ? ` (${w.segments} segments in all)` : "";
  if (kind === "range")
    return (
      `${where}: passing through the frames reaches ${formatQuantity(w.value, joint, "position")}, outside its travel ` +
      `${formatQuantity(joint.min, joint, "position")} to ${formatQuantity(joint.max, joint, "position")}${more}; the controller would refuse it.`
    );
  const quantity = kind === "speed-over" ? "velocity" : "acceleration";
  const word = kind === "speed-over" ? "speed" : "acceleration";
  const level = w.severity === "fault" ? "above its limit of" : "close to its limit of";
  return (
    `${where}: passing through the frames without stopping needs a ${word} of ${formatQuantity(w.value, joint, quantity)}, ` +
    `${level} ${formatQuantity(limit, joint, quantity)}${more}. Repair the episode, or replay it slower.`
  );
}

/**
 * Builds and checks the replay of a valid episode (columns in the arm's joint order; at least 2 frames).
 * `rest` defaults to the arm's home pose (0 where the travel allows, else mid-travel).
 */
export function replayOf(arm: Arm, recording: Recording, rest: number[] = homePose(arm)): EpisodeReplay {
  const { count, jointCount: n, position } = recording;
  const frame = (k: number) => Array.from(position.subarray(k * n, k * n + n));
  const first = frame(0);
  const last = frame(count - 1);
  const easeInS = easeDuration(arm, rest, first);
  const easeOutS = easeDuration(arm, last, rest);
  const easeIn = onePlan(arm, rest, first, easeInS);
  const easeOut = onePlan(arm, last, rest, easeOutS);
  const easeInReport = check(easeIn);
  const easeOutReport = check(easeOut);
  const passThrough = checkPassThrough(arm, recording);
  const parts = [easeInReport.verdict, passThrough.verdict, easeOutReport.verdict];
  const verdict: ReplayVerdict = parts.includes("fault")
    ? "fault"
    : passThrough.notChecked.length > 0
      ? "incomplete"
      : parts.includes("caution")
        ? "caution"
        : "pass";
  return { rest: [...rest], easeIn, easeInReport, easeOut, easeOutReport, easeInS, easeOutS, passThrough, verdict };
}

/**
 * Poses for the 3D view of a replay, as one plan: the ease moves and one cubic move per frame. Every
 * frame is reached at its time and the view stays between neighbouring frames, as the checked curve
 * does; the view's own speed between frames is not the checked motion and is not checked.
 */
export function replayViewPlan(arm: Arm, replay: EpisodeReplay, recording: Recording): Plan {
  const { count, jointCount: n, timeS, position } = recording;
  const moves: Move[] = [...replay.easeIn.moves];
  for (let k = 1; k < count; k++)
    moves.push({
      goal: Array.from(position.subarray(k * n, k * n + n)),
      duration: timeS[k] - timeS[k - 1],
      shape: "cubic",
    });
  moves.push(...replay.easeOut.moves);
  return { format: planFormat, version: planVersion, arm, start: [...replay.rest], moves } as Plan;
}
