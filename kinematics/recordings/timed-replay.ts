/**
 * Timed replay: a recording (or one episode of a dataset) checked as if each frame were reached in the
 * time between frames. Per joint j and frame k = 0…n−1, with Δtₖ = tₖ − tₖ₋₁ and Δqₖ = qₖ − qₖ₋₁:
 *
 * - `range` (fault): qₖ outside [min, max]; one finding per run of consecutive frames outside, at the
 *   run's first frame, with the run's farthest value.
 * - `speed-over`: |Δqₖ| / Δtₖ above cautionRatio × maxVelocity (caution) or above maxVelocity (fault);
 *   one finding per run of consecutive offending steps, at the later frame of the run's first step,
 *   with the run's worst speed, a fault if any step of the run is a fault.
 * - `glitch` (fault): frame k (1 ≤ k ≤ n−2) whose steps Δqₖ and Δqₖ₊₁ are both speed faults of opposite
 *   sign while its neighbours agree, |qₖ₊₁ − qₖ₋₁| ≤ maxVelocity × (tₖ₊₁ − tₖ₋₁). Reported instead of the
 *   speed-over of its two steps, which then count towards no speed-over run. Frames are scanned in
 *   order and a step belongs to at most one glitch (in 0, a, 0, a, 0 the glitches are frames 1 and 3).
 * - `gap` (caution): Δtₖ above 1.5 × the episode's median Δt (frames dropped); no joint.
 *
 * Equal to a limit passes (within {@link limitTolerance}). An episode with a non-finite value, time
 * that does not strictly increase, fewer than 2 frames or the wrong number of joints is `invalid`:
 * it gets problem lines instead of findings. The rules are the project's own (derived: a frame must
 * be reachable from the previous one at the joint's speed limit in the time between them).
 *
 * @module
 */
import type { Arm } from "../plan/arm";
import { findingKinds, limitTolerance, type FindingKind, type Severity, type Verdict } from "../check/report";
import { formatNumber, formatPercent, formatQuantity, jointLabel } from "../check/wording";
import type { Recording } from "./recording";

/** The verdict of one audited episode: a check verdict, or `invalid` when it could not be checked. */
export type EpisodeVerdict = Verdict | "invalid";

/** All episode verdicts, in the order summaries list them. */
export const episodeVerdicts: readonly EpisodeVerdict[] = ["pass", "caution", "fault", "invalid"];

/** A gap is a step longer than this many times the episode's median step. */
export const gapFactor = 1.5;

/** One timed-replay finding. */
export interface ReplayFinding {
  kind: FindingKind;
  severity: Severity;
  /** 0-based joint index, `null` for a `gap`. */
  joint: number | null;
  /** 0-based frame: the run's first frame (`range`), the later frame of its first step (`speed-over`), the spike (`glitch`), the frame after the gap (`gap`). */
  sample: number;
  /** 0-based last frame of the run (equal to `sample` for a glitch or gap). */
  endSample: number;
  /** Time of `sample`, s. */
  timeS: number;
  /** Worst value: position (rad or m) for `range`, speed (rad/s or m/s) for `speed-over` and `glitch`, step (s) for `gap`. */
  value: number;
  /** The limit compared with, same unit as `value`. */
  limit: number;
  /** `gap` only: estimated frames missing, round(Δt / median Δt) − 1, at least 1. */
  missingFrames?: number;
  message: string;
}

/** The audit of one episode. */
export interface EpisodeAudit {
  /** The episode's id (file name or episode column value). */
  episode: string;
  /** Number of frames. */
  samples: number;
  verdict: EpisodeVerdict;
  findings: ReplayFinding[];
  /** Why the episode is `invalid` (empty otherwise), each line naming the episode and the frame. */
  problems: string[];
}

/** Counts over a dataset's audits. */
export interface AuditSummary {
  episodes: number;
  pass: number;
  caution: number;
  fault: number;
  invalid: number;
  /** Findings per kind (only kinds that occur). */
  byKind: Record<string, number>;
}

/** One episode to audit: an id and its recording, columns in the arm's joint order. */
export interface Episode {
  id: string;
  recording: Recording;
}

/** Options for {@link auditEpisode}. */
export interface AuditOptions {
  /** Most problem lines per invalid episode (default 20); the rest are counted in one last line. */
  maxProblems?: number;
}

/**
 * The median of the steps tₖ − tₖ₋₁ (s) of a time column with at least two entries, by quickselect
 * (Hoare's FIND, Communications of the ACM 4(7), 1961 — memory) on a copy; one allocation per episode.
 */
export function medianStepS(timeS: Float64Array, count: number): number {
  const m = count - 1;
  const steps = new Float64Array(m);
  for (let k = 1; k < count; k++) steps[k - 1] = timeS[k] - timeS[k - 1];
  const upper = selectInPlace(steps, m >> 1);
  if (m % 2 === 1) return upper;
  // even count: the mean of the two middle values; the lower one is the largest left of the upper
  let lower = -Infinity;
  for (let i = 0; i < m >> 1; i++) if (steps[i] > lower) lower = steps[i];
  return 0.5 * (lower + upper);
}

/** Rearranges `a` so that a[k] is its k-th smallest value, everything left of k not above it; returns a[k]. */
function selectInPlace(a: Float64Array, k: number): number {
  let left = 0;
  let right = a.length - 1;
  while (left < right) {
    const pivot = a[(left + right) >> 1];
    let i = left;
    let j = right;
    while (i <= j) {
      while (a[i] < pivot) i++;
      while (a[j] > pivot) j--;
      if (i <= j) {
        const t = a[i];
        a[i] = a[j];
        a[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) right = j;
    else if (k >= i) left = i;
    else break;
  }
  return a[k];
}

/**
 * Why an episode cannot be audited: wrong joint count, fewer than 2 frames, non-finite values, time
 * not strictly increasing. Empty when it can be. Frames are counted from 1 in the lines.
 */
export function episodeProblems(arm: Arm, episode: Episode, options: AuditOptions = {}): string[] {
  const { id, recording } = episode;
  const { count, jointCount: n, timeS, position } = recording;
  const maxProblems = options.maxProblems ?? 20;
  const problems: string[] = [];
  let extra = 0;
  const add = (line: string) => {
    if (problems.length < maxProblems) problems.push(`episode ${id}: ${line}`);
    else extra++;
  };
  if (n !== arm.joints.length) {
    // the values cannot be matched to joints, so they are not checked one by one
    add(`has ${n} joint values per frame; the arm "${arm.name}" has ${arm.joints.length} joints`);
    return problems;
  }
  if (count < 2) add(`has ${count} frame${count === 1 ? "" : "s"}; a timed replay needs at least 2`);
  for (let k = 0; k < count; k++) {
    const t = timeS[k];
    if (!Number.isFinite(t)) add(`frame ${k + 1}: time is not a finite number (${t})`);
    else if (k > 0 && Number.isFinite(timeS[k - 1]) && !(t > timeS[k - 1])) {
      add(
        `frame ${k + 1}: time ${formatNumber(t)} s is not after the previous frame's ${formatNumber(timeS[k - 1])} s`,
      );
    }
    for (let j = 0; j < n; j++) {
      const q = position[k * n + j];
      if (!Number.isFinite(q)) {
        const name = recording.names[j] ?? arm.joints[j]?.name ?? `#${j + 1}`;
        add(`frame ${k + 1}, joint "${name}": position is not a finite number (${q})`);
      }
    }
  }
  if (extra > 0) problems.push(`episode ${id}: and ${extra} more problems`);
  return problems;
}

/**
 * The timed-replay audit of one episode against the arm's travel and speed limits (see the module
 * comment for the rules). One pass per joint over the frames; no allocation per frame.
 */
export function auditEpisode(arm: Arm, episode: Episode, options: AuditOptions = {}): EpisodeAudit {
  const { id, recording } = episode;
  const problems = episodeProblems(arm, episode, options);
  if (problems.length > 0) return { episode: id, samples: recording.count, verdict: "invalid", findings: [], problems };
  const findings = replayFindings(arm, recording);
  return { episode: id, samples: recording.count, verdict: verdictOfFindings(findings), findings, problems };
}

/** `fault` if any finding is a fault, `caution` if any finding at all, `pass` otherwise. */
function verdictOfFindings(findings: readonly ReplayFinding[]): Verdict {
  let verdict: Verdict = "pass";
  for (const f of findings) {
    if (f.severity === "fault") return "fault";
    verdict = "caution";
  }
  return verdict;
}

/**
 * The timed-replay findings of a valid recording (see {@link episodeProblems}), sorted by frame,
 * then joint (gaps first), then kind.
 */
export function replayFindings(arm: Arm, recording: Recording): ReplayFinding[] {
  const { count, jointCount: n, timeS, position } = recording;
  const ratio = arm.cautionRatio;
  const tol = 1 + limitTolerance;
  const found: ReplayFinding[] = [];

  // gap: a step longer than 1.5 × the median step
  const median = medianStepS(timeS, count);
  const gapLimit = gapFactor * median;
  for (let k = 1; k < count; k++) {
    const dt = timeS[k] - timeS[k - 1];
    if (dt > gapLimit * tol) found.push(gapFinding(k, timeS, dt, median, gapLimit));
  }

  for (let j = 0; j < n; j++) {
    const joint = arm.joints[j];
    const v = joint.maxVelocity;
    const speedFault = v * tol;
    const speedCaution = ratio * v * tol;
    const min = joint.min;
    const max = joint.max;
    // range run: first frame (−1 closed) and farthest value
    let rangeStart = -1;
    let rangeWorst = 0;
    let rangeDepth = 0;
    // speed run: first frame (−1 closed), worst speed, fault seen
    let speedStart = -1;
    let speedWorst = 0;
    let speedIsFault = false;
    const closeSpeed = (end: number) => {
      found.push(speedFinding(arm, j, speedStart, end, timeS, speedWorst, speedIsFault ? "fault" : "caution"));
      speedStart = -1;
    };
    for (let k = 0; k < count; k++) {
      const q = position[k * n + j];
      // range: the frame within travel (equal to a bound passes)
      if (q < min || q > max) {
        const depth = q < min ? min - q : q - max;
        if (rangeStart < 0) {
          rangeStart = k;
          rangeWorst = q;
          rangeDepth = depth;
        } else if (depth > rangeDepth) {
          rangeWorst = q;
          rangeDepth = depth;
        }
      } else if (rangeStart >= 0) {
        found.push(rangeFinding(arm, j, rangeStart, k - 1, timeS, rangeWorst));
        rangeStart = -1;
      }
      if (k === 0) continue;
      const dt = timeS[k] - timeS[k - 1];
      const dq = q - position[(k - 1) * n + j];
      const step = Math.abs(dq);
      // speed-over: backward difference |Δq|/Δt against maxVelocity, compared as |Δq| > v·Δt
      if (step <= speedCaution * dt) {
        if (speedStart >= 0) closeSpeed(k - 1);
        continue;
      }
      const fault = step > speedFault * dt;
      if (fault && k <= count - 2) {
        // glitch: this step and the next are speed faults of opposite sign, and frame k−1 and k+1 agree
        const qNext = position[(k + 1) * n + j];
        const dqNext = qNext - q;
        const dtNext = timeS[k + 1] - timeS[k];
        const agree = Math.abs(qNext - position[(k - 1) * n + j]) <= speedFault * (timeS[k + 1] - timeS[k - 1]);
        if (agree && dq * dqNext < 0 && Math.abs(dqNext) > speedFault * dtNext) {
          if (speedStart >= 0) closeSpeed(k - 1);
          const speed = Math.max(step / dt, Math.abs(dqNext) / dtNext);
          found.push(glitchFinding(arm, j, k, timeS, speed, q, position[(k - 1) * n + j], qNext));
          // frame k+1: its range is still checked; its step belongs to this glitch
          const q1 = qNext;
          if (q1 < min || q1 > max) {
            const depth = q1 < min ? min - q1 : q1 - max;
            if (rangeStart < 0) {
              rangeStart = k + 1;
              rangeWorst = q1;
              rangeDepth = depth;
            } else if (depth > rangeDepth) {
              rangeWorst = q1;
              rangeDepth = depth;
            }
          } else if (rangeStart >= 0) {
            found.push(rangeFinding(arm, j, rangeStart, k, timeS, rangeWorst));
            rangeStart = -1;
          }
          k++;
          continue;
        }
      }
      const speed = step / dt;
      if (speedStart < 0) {
        speedStart = k;
        speedWorst = speed;
        speedIsFault = fault;
      } else {
        if (speed > speedWorst) speedWorst = speed;
        if (fault) speedIsFault = true;
      }
    }
    if (rangeStart >= 0) found.push(rangeFinding(arm, j, rangeStart, count - 1, timeS, rangeWorst));
    if (speedStart >= 0) closeSpeed(count - 1);
  }
  found.sort(
    (a, b) =>
      a.sample - b.sample ||
      (a.joint ?? -1) - (b.joint ?? -1) ||
      findingKinds.indexOf(a.kind) - findingKinds.indexOf(b.kind),
  );
  return found;
}

/** `Joint "elbow", frame 12 (t = 0.367 s)` or `frames 12–14 (t = 0.367–0.433 s)`, frames counted from 1. */
function where(arm: Arm, j: number, sample: number, endSample: number, timeS: Float64Array): string {
  const label = jointLabel(arm.joints[j]);
  const span =
    endSample > sample
      ? `frames ${sample + 1}–${endSample + 1} (t = ${formatNumber(timeS[sample])}–${formatNumber(timeS[endSample])} s)`
      : `frame ${sample + 1} (t = ${formatNumber(timeS[sample])} s)`;
  return `${label[0].toUpperCase()}${label.slice(1)}, ${span}`;
}

function rangeFinding(
  arm: Arm,
  j: number,
  sample: number,
  endSample: number,
  timeS: Float64Array,
  value: number,
): ReplayFinding {
  const joint = arm.joints[j];
  const limit = value > joint.max ? joint.max : joint.min;
  return {
    kind: "range",
    severity: "fault",
    joint: j,
    sample,
    endSample,
    timeS: timeS[sample],
    value,
    limit,
    message:
      `${where(arm, j, sample, endSample, timeS)}: position ${formatQuantity(value, joint, "position")} is outside its travel ` +
      `${formatQuantity(joint.min, joint, "position")} to ${formatQuantity(joint.max, joint, "position")}; the controller would refuse ` +
      `these targets. Repair clamps them into the travel.`,
  };
}

function speedFinding(
  arm: Arm,
  j: number,
  sample: number,
  endSample: number,
  timeS: Float64Array,
  value: number,
  severity: Severity,
): ReplayFinding {
  const joint = arm.joints[j];
  const v = joint.maxVelocity;
  const level =
    severity === "fault" ? "above its limit of" : `above ${formatPercent(arm.cautionRatio)} of its limit of`;
  const outcome =
    severity === "fault"
      ? "replayed frame by frame the arm could not follow and would lag or fault"
      : "the arm would follow, close to its limit";
  return {
    kind: "speed-over",
    severity,
    joint: j,
    sample,
    endSample,
    timeS: timeS[sample],
    value,
    limit: v,
    message:
      `${where(arm, j, sample, endSample, timeS)}: speed up to ${formatQuantity(value, joint, "velocity")} between frames, ${level} ` +
      `${formatQuantity(v, joint, "velocity")}; ${outcome}. Repair rate-limits this stretch, or replay the episode slower.`,
  };
}

function glitchFinding(
  arm: Arm,
  j: number,
  k: number,
  timeS: Float64Array,
  value: number,
  q: number,
  qBefore: number,
  qAfter: number,
): ReplayFinding {
  const joint = arm.joints[j];
  const spike = q - 0.5 * (qBefore + qAfter); // departure from the neighbours' mean
  return {
    kind: "glitch",
    severity: "fault",
    joint: j,
    sample: k,
    endSample: k,
    timeS: timeS[k],
    value,
    limit: joint.maxVelocity,
    message:
      `${where(arm, j, k, k, timeS)}: a single-frame spike of ${formatQuantity(spike, joint, "step")} that comes back at the next frame ` +
      `(up to ${formatQuantity(value, joint, "velocity")}, above its limit of ${formatQuantity(joint.maxVelocity, joint, "velocity")}); ` +
      `replayed, the arm would twitch or fault. Repair replaces the frame with the mean of its neighbours.`,
  };
}

function gapFinding(k: number, timeS: Float64Array, dt: number, median: number, limit: number): ReplayFinding {
  const missingFrames = Math.max(1, Math.round(dt / median) - 1); // frames that would fit at the median step
  return {
    kind: "gap",
    severity: "caution",
    joint: null,
    sample: k,
    endSample: k,
    timeS: timeS[k],
    value: dt,
    limit,
    missingFrames,
    message:
      `Frame ${k + 1} (t = ${formatNumber(timeS[k])} s) comes ${formatNumber(dt)} s after the previous one, more than ` +
      `${formatNumber(gapFactor)} × the median step of ${formatNumber(median)} s: about ${missingFrames} frame${missingFrames === 1 ? "" : "s"} ` +
      `missing. The arm would be driven across the gap in one step. Repair fills it by interpolation (marked as filled).`,
  };
}

/** Audits every episode; an invalid episode does not stop the others. */
export function auditEpisodes(arm: Arm, episodes: Iterable<Episode>, options: AuditOptions = {}): EpisodeAudit[] {
  const out: EpisodeAudit[] = [];
  for (const episode of episodes) out.push(auditEpisode(arm, episode, options));
  return out;
}

/** Counts audits by verdict and findings by kind. */
export function summarizeAudits(
  audits: readonly { verdict: EpisodeVerdict; findings: readonly { kind: FindingKind }[] }[],
): AuditSummary {
  const summary: AuditSummary = { episodes: audits.length, pass: 0, caution: 0, fault: 0, invalid: 0, byKind: {} };
  for (const audit of audits) {
    summary[audit.verdict]++;
    for (const f of audit.findings) summary.byKind[f.kind] = (summary.byKind[f.kind] ?? 0) + 1;
  }
  return summary;
}

/** The worst severity of an audit's findings as a number: 0 none, 1 caution, 2 fault, 3 invalid. */
export function auditRank(audit: Pick<EpisodeAudit, "verdict">): number {
  return episodeVerdicts.indexOf(audit.verdict);
}

/** The JSON shape of one finding in the audit output (`jointproof audit --json`, the API). */
export interface ReplayFindingJson {
  kind: FindingKind;
  severity: Severity;
  joint: number | null;
  sample: number;
  timeS: number;
  value: number;
  limit: number;
  message: string;
}

/** The JSON shape of one episode in the audit output. */
export interface EpisodeAuditJson {
  episode: string;
  samples: number;
  verdict: EpisodeVerdict;
  findings: ReplayFindingJson[];
  problems: string[];
}

/** An audit in the output's exact shape (field order and names as documented). */
export function auditToJson(audit: EpisodeAudit): EpisodeAuditJson {
  return {
    episode: audit.episode,
    samples: audit.samples,
    verdict: audit.verdict,
    findings: audit.findings.map((f) => ({
      kind: f.kind,
      severity: f.severity,
      joint: f.joint,
      sample: f.sample,
      timeS: f.timeS,
      value: f.value,
      limit: f.limit,
      message: f.message,
    })),
    problems: audit.problems,
  };
}
