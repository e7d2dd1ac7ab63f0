/**
 * Joint efforts by recursive Newton–Euler inverse dynamics, plus Coulomb and viscous joint
 * friction with a smoothed sign. Works in each link's own frame on preallocated buffers.
 *
 * @module
 */
import type { CompiledChain } from "./chain";

/** Preallocated state for {@link inverseDynamics}; create once per chain. */
export interface DynamicsWorkspace {
  /** Per joint: rotation ᶦ⁻¹Rᵢ (9, column-major) and offset ᶦ⁻¹pᵢ (3) of link i in link i−1. */
  readonly rot: Float64Array;
  readonly pos: Float64Array;
  /** Per link: ω, ω̇, v̇ (of the frame origin), force F and moment N at the com, 3 each. */
  readonly w: Float64Array;
  readonly dw: Float64Array;
  readonly dv: Float64Array;
  readonly force: Float64Array;
  readonly moment: Float64Array;
  /** Coulomb friction per joint (N·m or N). */
  readonly coulomb: Float64Array;
  /** Viscous friction per joint (N·m·s/rad or N·s/m). */
  readonly viscous: Float64Array;
  /** Velocity scale of the smoothed sign (rad/s or m/s). */
  readonly signEpsilon: number;
  /** Scratch pose and a zero vector (n each). */
  readonly pose: Float64Array;
  readonly zero: Float64Array;
}

/** Friction coefficients per chain joint, as in the joint description. */
export interface FrictionInput {
  coulomb?: number;
  viscous?: number;
}

/**
 * Allocates the Newton–Euler workspace. `friction[i]` gives joint i's coefficients;
 * `signEpsilon` (default 0.01 rad/s) is the width of the smoothed sign tanh(q̇/ε).
 */
export function createDynamicsWorkspace(
  chain: CompiledChain,
  friction: readonly (FrictionInput | undefined)[] = [],
  signEpsilon = 0.01,
): DynamicsWorkspace {
  const n = chain.jointCount;
  const coulomb = new Float64Array(n),
    viscous = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    coulomb[i] = friction[i]?.coulomb ?? 0;
    viscous[i] = friction[i]?.viscous ?? 0;
  }
  return {
    rot: new Float64Array(9 * n),
    pos: new Float64Array(3 * n),
    w: new Float64Array(3 * (n + 1)),
    dw: new Float64Array(3 * (n + 1)),
    dv: new Float64Array(3 * (n + 1)),
    force: new Float64Array(3 * n),
    moment: new Float64Array(3 * n),
    coulomb,
    viscous,
    signEpsilon: signEpsilon > 0 ? signEpsilon : 0.01,
    pose: new Float64Array(n),
    zero: new Float64Array(n),
  };
}

/**
 * Friction effort τ_f = F_v·q̇ + F_c·sgn(q̇), opposing motion (Siciliano et al., Robotics:
 * Modelling, Planning and Control, 2009, §7.1 — memory), with sgn smoothed as tanh(q̇/ε)
 * so that it is continuous through q̇ = 0.
 */
export function frictionEffort(coulomb: number, viscous: number, velocity: number, epsilon: number): number {
  return viscous * velocity + coulomb * Math.tanh(velocity / epsilon);
}

/**
 * Recursive Newton–Euler inverse dynamics (Craig, Introduction to Robotics, 3rd ed.,
 * §6.5, eqs. 6.45–6.53; Siciliano et al. 2009 §7.5): the effort each joint needs to follow
 * position `q`, velocity `qd` and acceleration `qdd` (values at `offset` in each array, one
 * per chain joint). Gravity enters as a base acceleration of −g. With `includeGravity`
 * false, gravity is left out; with `includeFriction` false, friction is. Writes n efforts
 * (N·m or N) into `out` at `outOffset` and returns `out`.
 */
export function inverseDynamics(
  chain: CompiledChain,
  ws: DynamicsWorkspace,
  q: ArrayLike<number>,
  qd: ArrayLike<number>,
  qdd: ArrayLike<number>,
  out: Float64Array,
  offset = 0,
  outOffset = 0,
  includeGravity = true,
  includeFriction = true,
): Float64Array {
  const n = chain.jointCount;
  const { rot, pos, w, dw, dv, force, moment } = ws;
  const org = chain.origin,
    ax = chain.axis;
  // Base: at rest, accelerating upwards at −g (Craig eq. 6.49 trick for gravity).
  w[0] = w[1] = w[2] = dw[0] = dw[1] = dw[2] = 0;
  const gs = includeGravity ? 1 : 0;
  dv[0] = -gs * chain.gravity[0];
  dv[1] = -gs * chain.gravity[1];
  dv[2] = -gs * chain.gravity[2];

  for (let i = 0; i < n; i++) {
    const qi = q[offset + i],
      qdi = qd[offset + i],
      qddi = qdd[offset + i];
    const zx = ax[3 * i],
      zy = ax[3 * i + 1],
      zz = ax[3 * i + 2];
    const o = 16 * i;
    const r = 9 * i;
    // ᶦ⁻¹Rᵢ = R_origin · R_motion; ᶦ⁻¹pᵢ = p_origin (+ R_origin·z·q for a prismatic joint).
    if (chain.prismatic[i]) {
      for (let c = 0; c < 3; c++) for (let k = 0; k < 3; k++) rot[r + 3 * c + k] = org[o + 4 * c + k];
      for (let k = 0; k < 3; k++)
        pos[3 * i + k] = org[o + 12 + k] + (org[o + k] * zx + org[o + 4 + k] * zy + org[o + 8 + k] * zz) * qi;
    } else {
      // Rodrigues' formula for R_motion (Lynch & Park eq. 3.51), then R_origin · R_motion.
      const cq = Math.cos(qi),
        sq = Math.sin(qi),
        t = 1 - cq;
      const m00 = t * zx * zx + cq,
        m10 = t * zx * zy + sq * zz,
        m20 = t * zx * zz - sq * zy;
      const m01 = t * zx * zy - sq * zz,
        m11 = t * zy * zy + cq,
        m21 = t * zy * zz + sq * zx;
      const m02 = t * zx * zz + sq * zy,
        m12 = t * zy * zz - sq * zx,
        m22 = t * zz * zz + cq;
      for (let k = 0; k < 3; k++) {
        const a0 = org[o + k],
          a1 = org[o + 4 + k],
          a2 = org[o + 8 + k];
        rot[r + k] = a0 * m00 + a1 * m10 + a2 * m20;
        rot[r + 3 + k] = a0 * m01 + a1 * m11 + a2 * m21;
        rot[r + 6 + k] = a0 * m02 + a1 * m12 + a2 * m22;
        pos[3 * i + k] = org[o + 12 + k];
      }
    }
    const p = 3 * i,
      c0 = 3 * i,
      c1 = 3 * (i + 1);
    const px = pos[p],
      py = pos[p + 1],
      pz = pos[p + 2];
    const wx = w[c0],
      wy = w[c0 + 1],
      wz = w[c0 + 2];
    const dwx = dw[c0],
      dwy = dw[c0 + 1],
      dwz = dw[c0 + 2];
    // a = ω̇ × p + ω × (ω × p) + v̇ in frame i−1 (Craig eq. 6.47).
    const wpx = wy * pz - wz * py,
      wpy = wz * px - wx * pz,
      wpz = wx * py - wy * px;
    const ax0 = dwy * pz - dwz * py + (wy * wpz - wz * wpy) + dv[c0];
    const ay0 = dwz * px - dwx * pz + (wz * wpx - wx * wpz) + dv[c0 + 1];
    const az0 = dwx * py - dwy * px + (wx * wpy - wy * wpx) + dv[c0 + 2];
    // Rotate into frame i: x_i = Rᵀ·x_{i−1}.
    const rw0 = rot[r] * wx + rot[r + 1] * wy + rot[r + 2] * wz;
    const rw1 = rot[r + 3] * wx + rot[r + 4] * wy + rot[r + 5] * wz;
    const rw2 = rot[r + 6] * wx + rot[r + 7] * wy + rot[r + 8] * wz;
    const rdw0 = rot[r] * dwx + rot[r + 1] * dwy + rot[r + 2] * dwz;
    const rdw1 = rot[r + 3] * dwx + rot[r + 4] * dwy + rot[r + 5] * dwz;
    const rdw2 = rot[r + 6] * dwx + rot[r + 7] * dwy + rot[r + 8] * dwz;
    let dvx = rot[r] * ax0 + rot[r + 1] * ay0 + rot[r + 2] * az0;
    let dvy = rot[r + 3] * ax0 + rot[r + 4] * ay0 + rot[r + 5] * az0;
    let dvz = rot[r + 6] * ax0 + rot[r + 7] * ay0 + rot[r + 8] * az0;
    if (chain.prismatic[i]) {
      // Prismatic: ω unchanged; v̇ += 2ω × (ḋ z) + d̈ z (Craig eq. 6.50).
      w[c1] = rw0;
      w[c1 + 1] = rw1;
      w[c1 + 2] = rw2;
      dw[c1] = rdw0;
      dw[c1 + 1] = rdw1;
      dw[c1 + 2] = rdw2;
      dvx += 2 * qdi * (rw1 * zz - rw2 * zy) + qddi * zx;
      dvy += 2 * qdi * (rw2 * zx - rw0 * zz) + qddi * zy;
      dvz += 2 * qdi * (rw0 * zy - rw1 * zx) + qddi * zz;
    } else {
      // Revolute: ω = Rᵀω + q̇z; ω̇ = Rᵀω̇ + (Rᵀω) × q̇z + q̈z (Craig eqs. 6.45–6.46).
      w[c1] = rw0 + qdi * zx;
      w[c1 + 1] = rw1 + qdi * zy;
      w[c1 + 2] = rw2 + qdi * zz;
      dw[c1] = rdw0 + qdi * (rw1 * zz - rw2 * zy) + qddi * zx;
      dw[c1 + 1] = rdw1 + qdi * (rw2 * zx - rw0 * zz) + qddi * zy;
      dw[c1 + 2] = rdw2 + qdi * (rw0 * zy - rw1 * zx) + qddi * zz;
    }
    dv[c1] = dvx;
    dv[c1 + 1] = dvy;
    dv[c1 + 2] = dvz;
    // Com acceleration v̇c = ω̇ × c + ω × (ω × c) + v̇ (Craig eq. 6.48); F = m·v̇c (eq. 6.51).
    const m = chain.mass[i];
    const cx = chain.com[3 * i],
      cy = chain.com[3 * i + 1],
      cz = chain.com[3 * i + 2];
    const Wx = w[c1],
      Wy = w[c1 + 1],
      Wz = w[c1 + 2];
    const Dx = dw[c1],
      Dy = dw[c1 + 1],
      Dz = dw[c1 + 2];
    const wcx = Wy * cz - Wz * cy,
      wcy = Wz * cx - Wx * cz,
      wcz = Wx * cy - Wy * cx;
    force[p] = m * (Dy * cz - Dz * cy + (Wy * wcz - Wz * wcy) + dvx);
    force[p + 1] = m * (Dz * cx - Dx * cz + (Wz * wcx - Wx * wcz) + dvy);
    force[p + 2] = m * (Dx * cy - Dy * cx + (Wx * wcy - Wy * wcx) + dvz);
    // N = I·ω̇ + ω × I·ω (Euler's equation, Craig eq. 6.52).
    const I = chain.inertia,
      ii = 9 * i;
    const iwx = I[ii] * Wx + I[ii + 3] * Wy + I[ii + 6] * Wz;
    const iwy = I[ii + 1] * Wx + I[ii + 4] * Wy + I[ii + 7] * Wz;
    const iwz = I[ii + 2] * Wx + I[ii + 5] * Wy + I[ii + 8] * Wz;
    moment[p] = I[ii] * Dx + I[ii + 3] * Dy + I[ii + 6] * Dz + (Wy * iwz - Wz * iwy);
    moment[p + 1] = I[ii + 1] * Dx + I[ii + 4] * Dy + I[ii + 7] * Dz + (Wz * iwx - Wx * iwz);
    moment[p + 2] = I[ii + 2] * Dx + I[ii + 5] * Dy + I[ii + 8] * Dz + (Wx * iwy - Wy * iwx);
  }

  // Backward pass: f_i = F_i + R_{i+1}·f_{i+1}; n_i = N_i + R_{i+1}·n_{i+1} + c × F_i + p_{i+1} × (R_{i+1}·f_{i+1})
  // (Craig eqs. 6.51–6.53). Accumulated in place: force/moment of link i become f_i/n_i.
  for (let i = n - 1; i >= 0; i--) {
    const p = 3 * i;
    if (i < n - 1) {
      const r = 9 * (i + 1),
        c = 3 * (i + 1);
      const fx = force[c],
        fy = force[c + 1],
        fz = force[c + 2];
      const nx = moment[c],
        ny = moment[c + 1],
        nz = moment[c + 2];
      const rfx = rot[r] * fx + rot[r + 3] * fy + rot[r + 6] * fz;
      const rfy = rot[r + 1] * fx + rot[r + 4] * fy + rot[r + 7] * fz;
      const rfz = rot[r + 2] * fx + rot[r + 5] * fy + rot[r + 8] * fz;
      const rnx = rot[r] * nx + rot[r + 3] * ny + rot[r + 6] * nz;
      const rny = rot[r + 1] * nx + rot[r + 4] * ny + rot[r + 7] * nz;
      const rnz = rot[r + 2] * nx + rot[r + 5] * ny + rot[r + 8] * nz;
      const qx = pos[c],
        qy = pos[c + 1],
        qz = pos[c + 2];
      const cx = chain.com[p],
        cy = chain.com[p + 1],
        cz = chain.com[p + 2];
      const Fx = force[p],
        Fy = force[p + 1],
        Fz = force[p + 2];
      moment[p] += rnx + (cy * Fz - cz * Fy) + (qy * rfz - qz * rfy);
      moment[p + 1] += rny + (cz * Fx - cx * Fz) + (qz * rfx - qx * rfz);
      moment[p + 2] += rnz + (cx * Fy - cy * Fx) + (qx * rfy - qy * rfx);
      force[p] = Fx + rfx;
      force[p + 1] = Fy + rfy;
      force[p + 2] = Fz + rfz;
    } else {
      const cx = chain.com[p],
        cy = chain.com[p + 1],
        cz = chain.com[p + 2];
      const Fx = force[p],
        Fy = force[p + 1],
        Fz = force[p + 2];
      moment[p] += cy * Fz - cz * Fy;
      moment[p + 1] += cz * Fx - cx * Fz;
      moment[p + 2] += cx * Fy - cy * Fx;
    }
  }
  for (let i = 0; i < n; i++) {
    const p = 3 * i;
    const src = chain.prismatic[i] ? force : moment;
    // τᵢ = nᵢ·z (revolute) or fᵢ·z (prismatic) (Craig eq. 6.53).
    let tau = src[p] * ax[p] + src[p + 1] * ax[p + 1] + src[p + 2] * ax[p + 2];
    if (includeFriction) tau += frictionEffort(ws.coulomb[i], ws.viscous[i], qd[offset + i], ws.signEpsilon);
    out[outOffset + i] = tau;
  }
  return out;
}

/**
 * Gravity-only efforts at a pose (no motion, no friction): the load that holds the arm still,
 * which no choice of duration can lower. Reads n values of `q` from `offset`.
 */
export function gravityEffort(
  chain: CompiledChain,
  ws: DynamicsWorkspace,
  q: ArrayLike<number>,
  out: Float64Array,
  offset = 0,
  outOffset = 0,
): Float64Array {
  const n = chain.jointCount;
  for (let i = 0; i < n; i++) ws.pose[i] = q[offset + i];
  return inverseDynamics(chain, ws, ws.pose, ws.zero, ws.zero, out, 0, outOffset, true, false);
}

/**
 * The gravity-only efforts of {@link gravityEffort} at the pose of the last {@link inverseDynamics}
 * call on `ws` (whose link rotations and offsets it reuses instead of recomputing them): with
 * q̇ = q̈ = 0 every ω and ω̇ vanishes, so the forward pass only rotates v̇ = −g into each frame and
 * F = m·v̇, N = 0 (Craig eqs. 6.47–6.52 with those terms zero), and the backward pass is the same
 * (eq. 6.53). The same arithmetic on the non-zero terms, so the values equal gravityEffort's.
 * Writes n efforts (N·m or N) into `out` at `outOffset`.
 */
export function gravityEffortAtLastPose(
  chain: CompiledChain,
  ws: DynamicsWorkspace,
  out: Float64Array,
  outOffset = 0,
): Float64Array {
  const n = chain.jointCount;
  const { rot, pos, force, moment } = ws;
  const ax = chain.axis;
  let gx = -chain.gravity[0],
    gy = -chain.gravity[1],
    gz = -chain.gravity[2];
  for (let i = 0; i < n; i++) {
    const r = 9 * i,
      p = 3 * i;
    const dvx = rot[r] * gx + rot[r + 1] * gy + rot[r + 2] * gz;
    const dvy = rot[r + 3] * gx + rot[r + 4] * gy + rot[r + 5] * gz;
    const dvz = rot[r + 6] * gx + rot[r + 7] * gy + rot[r + 8] * gz;
    const m = chain.mass[i];
    force[p] = m * dvx;
    force[p + 1] = m * dvy;
    force[p + 2] = m * dvz;
    moment[p] = 0;
    moment[p + 1] = 0;
    moment[p + 2] = 0;
    gx = dvx;
    gy = dvy;
    gz = dvz;
  }
  // The backward pass of inverseDynamics repeated on purpose (a performance specialisation: sharing it
  // would cost a call per link in the engine's hottest loop); a test pins both to the last bit.
  for (let i = n - 1; i >= 0; i--) {
    const p = 3 * i;
    const cx = chain.com[p],
      cy = chain.com[p + 1],
      cz = chain.com[p + 2];
    const Fx = force[p],
      Fy = force[p + 1],
      Fz = force[p + 2];
    if (i < n - 1) {
      const r = 9 * (i + 1),
        c = 3 * (i + 1);
      const fx = force[c],
        fy = force[c + 1],
        fz = force[c + 2];
      const nx = moment[c],
        ny = moment[c + 1],
        nz = moment[c + 2];
      const rfx = rot[r] * fx + rot[r + 3] * fy + rot[r + 6] * fz;
      const rfy = rot[r + 1] * fx + rot[r + 4] * fy + rot[r + 7] * fz;
      const rfz = rot[r + 2] * fx + rot[r + 5] * fy + rot[r + 8] * fz;
      const rnx = rot[r] * nx + rot[r + 3] * ny + rot[r + 6] * nz;
      const rny = rot[r + 1] * nx + rot[r + 4] * ny + rot[r + 7] * nz;
      const rnz = rot[r + 2] * nx + rot[r + 5] * ny + rot[r + 8] * nz;
      const qx = pos[c],
        qy = pos[c + 1],
        qz = pos[c + 2];
      moment[p] += rnx + (cy * Fz - cz * Fy) + (qy * rfz - qz * rfy);
      moment[p + 1] += rny + (cz * Fx - cx * Fz) + (qz * rfx - qx * rfz);
      moment[p + 2] += rnz + (cx * Fy - cy * Fx) + (qx * rfy - qy * rfx);
      force[p] = Fx + rfx;
      force[p + 1] = Fy + rfy;
      force[p + 2] = Fz + rfz;
    } else {
      moment[p] += cy * Fz - cz * Fy;
      moment[p + 1] += cz * Fx - cx * Fz;
      moment[p + 2] += cx * Fy - cy * Fx;
    }
  }
  for (let i = 0; i < n; i++) {
    const p = 3 * i;
    const src = chain.prismatic[i] ? force : moment;
    out[outOffset + i] = src[p] * ax[p] + src[p + 1] * ax[p + 1] + src[p + 2] * ax[p + 2];
  }
  return out;
}

/**
 * The tool-point speed (m/s) at the pose and joint velocities of the last {@link inverseDynamics}
 * call on `ws`, reusing its link rotations, offsets and angular velocities: the linear-velocity
 * recursion of the same forward pass, vᵢ = ᶦ⁻¹Rᵢᵀ·(vᵢ₋₁ + ωᵢ₋₁ × pᵢ), plus ḋᵢ·zᵢ for a prismatic
 * joint (Craig, Introduction to Robotics, 3rd ed., §5.6, eqs. 5.45–5.47), then the tool point
 * v = vₙ + ωₙ × p_tool in the last link's frame. The speed is |J_v(q)·q̇| of the geometric Jacobian
 * (Siciliano et al. 2009, §3.1); a test compares both. `qd` holds the velocities of that call.
 */
export function toolSpeedAtLastPose(
  chain: CompiledChain,
  ws: DynamicsWorkspace,
  qd: ArrayLike<number>,
  offset = 0,
): number {
  const n = chain.jointCount;
  const { rot, pos, w } = ws;
  const ax = chain.axis;
  let vx = 0,
    vy = 0,
    vz = 0;
  for (let i = 0; i < n; i++) {
    const r = 9 * i,
      p = 3 * i;
    const wx = w[p],
      wy = w[p + 1],
      wz = w[p + 2];
    const px = pos[p],
      py = pos[p + 1],
      pz = pos[p + 2];
    const ux = vx + (wy * pz - wz * py),
      uy = vy + (wz * px - wx * pz),
      uz = vz + (wx * py - wy * px);
    vx = rot[r] * ux + rot[r + 1] * uy + rot[r + 2] * uz;
    vy = rot[r + 3] * ux + rot[r + 4] * uy + rot[r + 5] * uz;
    vz = rot[r + 6] * ux + rot[r + 7] * uy + rot[r + 8] * uz;
    if (chain.prismatic[i]) {
      const d = qd[offset + i];
      vx += d * ax[p];
      vy += d * ax[p + 1];
      vz += d * ax[p + 2];
    }
  }
  const c = 3 * n;
  const t = chain.tool;
  const tx = t[12],
    ty = t[13],
    tz = t[14];
  const wx = w[c],
    wy = w[c + 1],
    wz = w[c + 2];
  return Math.hypot(vx + (wy * tz - wz * ty), vy + (wz * tx - wx * tz), vz + (wx * ty - wy * tx));
}
