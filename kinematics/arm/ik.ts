/**
 * Inverse kinematics for a Cartesian goal: damped least squares on the geometric Jacobian,
 * seeded from the current pose, each step clamped into the joint limits, with an adaptive
 * damping factor (Levenberg–Marquardt style) and a few deterministic restarts. Returns a
 * clear `reachable: false` when it cannot get within tolerance.
 *
 * @module
 */
import type { CartesianGoal } from "../plan/arm-model";
import { createChainBuffers, forwardKinematics, toolJacobian, type CompiledChain } from "./chain";
import * as mat4 from "./mat4";

/** Options of {@link solveIk}; lengths in metres, angles in radians. */
export interface IkOptions {
  /** Starting pose (the current pose); defaults to the middle of each joint's travel. */
  seed?: ArrayLike<number>;
  /** Lower joint limits (m or rad); `-Infinity` or missing for none. */
  lower?: ArrayLike<number>;
  /** Upper joint limits; `Infinity` or missing for none. */
  upper?: ArrayLike<number>;
  /** Accepted tool-point position error (m), default 1e-4. */
  positionToleranceM?: number;
  /** Accepted orientation error (rad), default 1e-3. */
  orientationToleranceRad?: number;
  /** Iterations per attempt, default 150. */
  maxIterations?: number;
  /** Initial damping λ, default 0.05. */
  damping?: number;
  /** Extra attempts from deterministic pseudo-random seeds inside the limits, default 12. */
  restarts?: number;
  /** Largest joint change per iteration (rad or m), default 0.4. */
  maxStep?: number;
}

/** Result of {@link solveIk}. */
export interface IkResult {
  /** The best pose found (chain joints; extra seed entries are carried through). */
  pose: number[];
  /** Remaining tool-point position error (m). */
  positionErrorM: number;
  /** Remaining orientation error (rad); 0 when no orientation was asked for. */
  orientationErrorRad: number;
  /** True when both errors are within tolerance. */
  reachable: boolean;
  /** Total iterations over all attempts. */
  iterations: number;
}

const scratchE = new Float64Array(9);

/**
 * Orientation error ω (rad, base frame) with exp([ω]) = R_target·R_currentᵀ: the matrix
 * logarithm of Lynch & Park, Modern Robotics (2017), §3.2.3.3, including its θ = π branch.
 * Writes 3 values into `out` at `oo`.
 */
export function rotationErrorVector(
  out: Float64Array,
  target: Float64Array,
  current: Float64Array,
  oo = 0,
): Float64Array {
  // E = Rt·Rcᵀ; E[r][c] = Σk Rt[r][k]·Rc[c][k] (column-major element [r + 4c]).
  const e = scratchE;
  for (let r = 0; r < 3; r++)
    for (let c = 0; c < 3; c++) {
      let s = 0;
      for (let k = 0; k < 3; k++) s += target[r + 4 * k] * current[c + 4 * k];
      e[r + 3 * c] = s;
    }
  const tr = e[0] + e[4] + e[8];
  const cosT = Math.max(-1, Math.min(1, (tr - 1) / 2)); // clamp before acos
  const theta = Math.acos(cosT);
  const vx = e[5] - e[7],
    vy = e[6] - e[2],
    vz = e[1] - e[3]; // vee(E − Eᵀ)
  if (theta < 1e-9) {
    out[oo] = out[oo + 1] = out[oo + 2] = 0;
  } else if (Math.PI - theta > 1e-6) {
    const k = theta / (2 * Math.sin(theta)); // ω = θ/(2 sinθ)·vee(E − Eᵀ)
    out[oo] = k * vx;
    out[oo + 1] = k * vy;
    out[oo + 2] = k * vz;
  } else {
    // θ ≈ π: axis from the largest diagonal term, ωᵢ = θ·(E[:,i] + eᵢ)/√(2(1 + Eᵢᵢ)).
    let i = 0;
    if (e[4] > e[0]) i = 1;
    if (e[8] > e[4 * i]) i = 2;
    const d = Math.sqrt(Math.max(1e-12, 2 * (1 + e[4 * i])));
    for (let r = 0; r < 3; r++) out[oo + r] = (theta * (e[r + 3 * i] + (r === i ? 1 : 0))) / d;
  }
  return out;
}

/** Solves the m×m system A·x = b in place by Gaussian elimination with partial pivoting; false if singular. */
export function solveLinear(a: Float64Array, b: Float64Array, m: number): boolean {
  for (let col = 0; col < m; col++) {
    let piv = col;
    for (let r = col + 1; r < m; r++) if (Math.abs(a[r * m + col]) > Math.abs(a[piv * m + col])) piv = r;
    if (Math.abs(a[piv * m + col]) < 1e-300) return false; // never divide by zero
    if (piv !== col) {
      for (let c = 0; c < m; c++) {
        const t = a[col * m + c];
        a[col * m + c] = a[piv * m + c];
        a[piv * m + c] = t;
      }
      const t = b[col];
      b[col] = b[piv];
      b[piv] = t;
    }
    for (let r = col + 1; r < m; r++) {
      const f = a[r * m + col] / a[col * m + col];
      for (let c = col; c < m; c++) a[r * m + c] -= f * a[col * m + c];
      b[r] -= f * b[col];
    }
  }
  for (let r = m - 1; r >= 0; r--) {
    let s = b[r];
    for (let c = r + 1; c < m; c++) s -= a[r * m + c] * b[c];
    b[r] = s / a[r * m + r];
  }
  return true;
}

/**
 * Damped least-squares IK: Δq = Jᵀ(J·Jᵀ + λ²I)⁻¹·e (Buss, "Introduction to Inverse
 * Kinematics with Jacobian Transpose, Pseudoinverse and Damped Least Squares methods",
 * 2004, eq. 11 — memory; Siciliano et al. 2009 §3.7). e is the position error (3 rows) and,
 * when the goal has `rpy`, the orientation error vector (3 more rows).
 */
export function solveIk(chain: CompiledChain, goal: CartesianGoal, options: IkOptions = {}): IkResult {
  const n = chain.jointCount;
  const withRot = goal.rpy !== undefined;
  const m = withRot ? 6 : 3;
  const tolP = options.positionToleranceM ?? 1e-4;
  const tolR = options.orientationToleranceRad ?? 1e-3;
  // Orientation rows are weighted by tolP/tolR (m/rad) so that both errors count in units of
  // their own tolerance. With equal weights a target near a wrist singularity (two wrist axes
  // almost parallel) let the solver trade position for orientation along a shallow valley and
  // stall on a joint limit 0.6 mm away (found by the IK round-trip property test; derived).
  const W = tolP / tolR;
  const maxIter = options.maxIterations ?? 150;
  const maxStep = options.maxStep ?? 0.4;
  const restarts = options.restarts ?? 12;
  const lower = new Float64Array(n),
    upper = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const lo = options.lower?.[i],
      hi = options.upper?.[i];
    lower[i] = lo !== undefined && lo !== null && Number.isFinite(lo) ? lo : -Infinity;
    upper[i] = hi !== undefined && hi !== null && Number.isFinite(hi) ? hi : Infinity;
  }
  const target = mat4.fromXyzRpy(mat4.create(), goal.position, goal.rpy ?? [0, 0, 0]);
  const buf = createChainBuffers(chain);
  const jac = new Float64Array(6 * n);
  const a = new Float64Array(m * m);
  const y = new Float64Array(m);
  const err = new Float64Array(6);
  const free = new Uint8Array(n);
  const q = new Float64Array(n),
    trial = new Float64Array(n),
    best = new Float64Array(n);
  let bestCost = Infinity,
    bestP = Infinity,
    bestR = Infinity;
  let iterations = 0;

  const clampInto = (v: Float64Array) => {
    for (let i = 0; i < n; i++) v[i] = Math.min(upper[i], Math.max(lower[i], v[i]));
  };
  // Fills err, returns the squared error norm; FK stays in `buf` for the Jacobian.
  const evaluate = (pose: Float64Array): number => {
    const t = forwardKinematics(chain, pose, buf);
    err[0] = target[12] - t[12];
    err[1] = target[13] - t[13];
    err[2] = target[14] - t[14];
    if (withRot) {
      rotationErrorVector(err, target, t, 3);
      err[3] *= W;
      err[4] *= W;
      err[5] *= W;
    }
    let s = 0;
    for (let k = 0; k < m; k++) s += err[k] * err[k];
    return s;
  };
  const errs = () => ({
    p: Math.hypot(err[0], err[1], err[2]),
    r: withRot ? Math.hypot(err[3], err[4], err[5]) / W : 0,
  });
  // Deterministic pseudo-random numbers for restarts (a 32-bit LCG, Numerical Recipes §7.1).
  let state = 0x2545f491;
  const rand = () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
    return state / 4294967296;
  };

  for (let attempt = 0; attempt <= restarts; attempt++) {
    for (let i = 0; i < n; i++) {
      const lo = Number.isFinite(lower[i]) ? lower[i] : -Math.PI;
      const hi = Number.isFinite(upper[i]) ? upper[i] : Math.PI;
      const s = options.seed?.[i];
      const start = s !== undefined && Number.isFinite(s) ? s : (lo + hi) / 2;
      // Restarts alternate between the seed's neighbourhood (growing radius: a seed resting on a
      // limit often has its solution just inside it, past a local minimum on the limit) and the
      // whole travel (other solution branches). Derived; found by the IK round-trip property test.
      const radius = 0.3 * Math.ceil(attempt / 2);
      q[i] =
        attempt === 0
          ? start
          : attempt % 2 === 1
            ? start + (2 * rand() - 1) * radius * Math.min(1, (hi - lo) / 2)
            : lo + rand() * (hi - lo);
    }
    clampInto(q);
    let cost = evaluate(q);
    let lambda = options.damping ?? 0.05;
    for (let it = 0; it < maxIter; it++) {
      const e = errs();
      if (e.p <= tolP && e.r <= tolR) break;
      iterations++;
      toolJacobian(chain, buf, jac);
      if (withRot) for (let k = 3 * n; k < 6 * n; k++) jac[k] *= W;
      // Active set: a joint resting on a limit whose step would push it further out is left
      // out of the solve, so the other joints get the full least-squares step instead of a
      // clamped (and so mis-directed) one (derived; fewer iterations spent on a limit stop).
      free.fill(1);
      let stepMax = 0;
      let solved = true;
      for (let pass = 0; pass <= n; pass++) {
        // A = J·Jᵀ + λ²I over the first m rows of the 6×n Jacobian, free columns only.
        for (let r = 0; r < m; r++)
          for (let c = 0; c < m; c++) {
            let s = r === c ? lambda * lambda : 0;
            for (let k = 0; k < n; k++) if (free[k]) s += jac[r * n + k] * jac[c * n + k];
            a[r * m + c] = s;
          }
        for (let r = 0; r < m; r++) y[r] = err[r];
        solved = solveLinear(a, y, m);
        if (!solved) break;
        stepMax = 0;
        let locked = false;
        for (let k = 0; k < n; k++) {
          let s = 0;
          if (free[k]) for (let r = 0; r < m; r++) s += jac[r * n + k] * y[r]; // Δq = Jᵀ·y
          trial[k] = s;
          stepMax = Math.max(stepMax, Math.abs(s));
          if (free[k] && ((q[k] <= lower[k] && s < 0) || (q[k] >= upper[k] && s > 0))) {
            free[k] = 0;
            locked = true;
          }
        }
        if (!locked) break;
      }
      if (!solved) break;
      const scale = stepMax > maxStep ? maxStep / stepMax : 1;
      for (let k = 0; k < n; k++) trial[k] = q[k] + scale * trial[k];
      clampInto(trial);
      const trialCost = evaluate(trial);
      if (trialCost < cost) {
        q.set(trial);
        cost = trialCost;
        lambda = Math.max(lambda * 0.5, 1e-5);
      } else {
        evaluate(q); // restore err and frames at q
        lambda *= 4;
        if (lambda > 1e4) break; // no descent direction left: a local minimum or a limit stop
      }
    }
    const e = errs();
    if (cost < bestCost) {
      bestCost = cost;
      best.set(q);
      bestP = e.p;
      bestR = e.r;
    }
    if (bestP <= tolP && bestR <= tolR) break;
  }
  const pose = Array.from(best);
  if (options.seed) for (let i = n; i < options.seed.length; i++) pose.push(options.seed[i]);
  return {
    pose,
    positionErrorM: bestP,
    orientationErrorRad: bestR,
    reachable: bestP <= tolP && bestR <= tolR,
    iterations,
  };
}
