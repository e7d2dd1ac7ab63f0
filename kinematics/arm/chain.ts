/**
 * The arm's kinematic chain compiled into flat typed arrays, and forward kinematics that
 * writes every link frame and the tool pose into preallocated buffers (no allocation per
 * sample). The 3D viewer draws each link's collision shapes in the frames from
 * {@link linkFrames}; frame 0 is the base, frame i follows joint i.
 *
 * @module
 */
import type { ArmChain, ArmDescription, Inertia, Payload } from "../plan/arm-model";
import * as mat4 from "./mat4";

/** Joint motion kinds the chain distinguishes (`continuous` moves like `revolute`). */
export type ChainJointType = "revolute" | "continuous" | "prismatic";

/** A chain ready for numerics: everything in flat `Float64Array`s, indexed by joint. */
export interface CompiledChain {
  /** Number of moving joints in the chain. */
  readonly jointCount: number;
  /** Joint i's origin transform in link (i−1)'s frame, 16 values per joint (column-major). */
  readonly origin: Float64Array;
  /** Joint i's unit axis in its joint frame, 3 values per joint. */
  readonly axis: Float64Array;
  /** 1 where joint i is prismatic, 0 where it is revolute or continuous. */
  readonly prismatic: Uint8Array;
  /** The tool point in the last link's frame. */
  readonly tool: Float64Array;
  /** Link i's mass (kg) for i = 1..n at index i−1, payload merged into the last link. */
  readonly mass: Float64Array;
  /** Link centre of mass (m) in the link frame, 3 per link. */
  readonly com: Float64Array;
  /** Link inertia about its centre of mass in link axes (kg·m²), 9 per link, column-major 3×3. */
  readonly inertia: Float64Array;
  /** Gravity in the base frame (m/s²). */
  readonly gravity: Float64Array;
  /** Link names: index 0 the base, index i the link after joint i. */
  readonly linkNames: readonly string[];
}

/** Preallocated FK output for one chain. */
export interface ChainBuffers {
  /** n + 1 link frames in the base frame, 16 values each: frame 0 is the base (identity). */
  readonly frames: Float64Array;
  /** The tool pose in the base frame. */
  readonly tool: Float64Array;
  /** Scratch matrix (callers may use it; FK itself needs none). */
  readonly motion: Float64Array;
}

/** Mass properties in flat form: mass (kg), com (m), 3×3 inertia about the com (kg·m², column-major). */
export interface FlatInertial {
  mass: number;
  com: [number, number, number];
  inertia: number[];
}

/** Inertia tensor fields to a column-major 3×3 array. */
export function inertiaToMatrix(i: Inertia): number[] {
  return [i.ixx, i.ixy, i.ixz, i.ixy, i.iyy, i.iyz, i.ixz, i.iyz, i.izz];
}

/**
 * Moves mass properties into another frame: com' = T·com, I' = R·I·Rᵀ
 * (rotation of an inertia tensor, Lynch & Park, Modern Robotics, eq. 8.27).
 */
export function transformInertial(t: ArrayLike<number>, a: FlatInertial): FlatInertial {
  const com = [0, 0, 0];
  mat4.transformPoint(com, t, a.com);
  const out = new Array<number>(9).fill(0);
  for (let r = 0; r < 3; r++)
    for (let c = 0; c < 3; c++) {
      let s = 0;
      for (let k = 0; k < 3; k++) for (let l = 0; l < 3; l++) s += t[4 * k + r] * a.inertia[3 * l + k] * t[4 * l + c];
      out[3 * c + r] = s;
    }
  return { mass: a.mass, com: [com[0], com[1], com[2]], inertia: out };
}

/**
 * Combines two bodies fixed in one frame into one: total mass, mass-weighted com, and the
 * inertia about the new com by the parallel-axis theorem I = Σ Iₖ + mₖ(|d|²E − d·dᵀ)
 * (Lynch & Park, Modern Robotics, eq. 8.28).
 */
export function combineInertial(a: FlatInertial, b: FlatInertial): FlatInertial {
  const mass = a.mass + b.mass;
  if (mass <= 0) return { mass: 0, com: [0, 0, 0], inertia: new Array<number>(9).fill(0) };
  const com: [number, number, number] = [0, 0, 0];
  for (let k = 0; k < 3; k++) com[k] = (a.mass * a.com[k] + b.mass * b.com[k]) / mass;
  const inertia = new Array<number>(9).fill(0);
  for (const body of [a, b]) {
    const d = [body.com[0] - com[0], body.com[1] - com[1], body.com[2] - com[2]];
    const dd = d[0] * d[0] + d[1] * d[1] + d[2] * d[2];
    for (let r = 0; r < 3; r++)
      for (let c = 0; c < 3; c++)
        inertia[3 * c + r] += body.inertia[3 * c + r] + body.mass * ((r === c ? dd : 0) - d[r] * d[c]);
  }
  return { mass, com, inertia };
}

/**
 * Compiles `arm.chain` into flat arrays. `jointTypes[i]` is `arm.joints[i].type`; the
 * optional payload is fixed to the tool point and merged into the last link's mass.
 */
export function compileChain(
  chain: ArmChain,
  jointTypes: readonly (ChainJointType | undefined)[],
  payload?: Payload,
): CompiledChain {
  const n = chain.joints.length;
  const origin = new Float64Array(16 * n);
  const axis = new Float64Array(3 * n);
  const prismatic = new Uint8Array(n);
  const mass = new Float64Array(n);
  const com = new Float64Array(3 * n);
  const inertia = new Float64Array(9 * n);
  const linkNames: string[] = [chain.base.name ?? "base"];
  chain.joints.forEach((j, i) => {
    mat4.fromXyzRpy(origin, j.origin.xyz, j.origin.rpy, 16 * i);
    const len = Math.hypot(j.axis[0], j.axis[1], j.axis[2]);
    // Unit axis (schema guarantees len > 0).
    for (let k = 0; k < 3; k++) axis[3 * i + k] = j.axis[k] / len;
    prismatic[i] = jointTypes[i] === "prismatic" ? 1 : 0;
    linkNames.push(j.link.name ?? `link${i + 1}`);
    let body: FlatInertial = j.link.inertial
      ? { mass: j.link.inertial.mass, com: [...j.link.inertial.com], inertia: inertiaToMatrix(j.link.inertial.inertia) }
      : { mass: 0, com: [0, 0, 0], inertia: new Array<number>(9).fill(0) };
    if (i === n - 1 && payload && payload.mass > 0) {
      const tool = mat4.fromXyzRpy(mat4.create(), chain.tool.xyz, chain.tool.rpy);
      const p = transformInertial(tool, {
        mass: payload.mass,
        com: [...payload.com],
        inertia: payload.inertia ? inertiaToMatrix(payload.inertia) : new Array<number>(9).fill(0),
      });
      body = combineInertial(body, p);
    }
    mass[i] = body.mass;
    for (let k = 0; k < 3; k++) com[3 * i + k] = body.com[k];
    for (let k = 0; k < 9; k++) inertia[9 * i + k] = body.inertia[k];
  });
  const tool = mat4.fromXyzRpy(mat4.create(), chain.tool.xyz, chain.tool.rpy);
  return {
    jointCount: n,
    origin,
    axis,
    prismatic,
    tool,
    mass,
    com,
    inertia,
    gravity: Float64Array.from(chain.gravity),
    linkNames,
  };
}

/** Allocates the FK buffers for a compiled chain once; reuse them for every sample. */
export function createChainBuffers(chain: CompiledChain): ChainBuffers {
  const frames = new Float64Array(16 * (chain.jointCount + 1));
  mat4.identity(frames, 0);
  return { frames, tool: mat4.create(), motion: mat4.create() };
}

/**
 * All link frames for a pose: writes n + 1 base-frame transforms into `out` (16 values each;
 * frame 0 is the base). Frame i = frame(i−1) · origin(i) · motion(qᵢ), the URDF joint model;
 * extra pose entries beyond the chain (e.g. a gripper) are ignored.
 */
export function linkFrames(
  chain: CompiledChain,
  pose: ArrayLike<number>,
  out: Float64Array,
  poseOffset = 0,
): Float64Array {
  mat4.identity(out, 0);
  const ax = chain.axis;
  for (let i = 0; i < chain.jointCount; i++) {
    const q = pose[poseOffset + i];
    const o = 16 * (i + 1);
    // A = frame(i−1) · origin(i), written into frame i's slot.
    mat4.multiplyRigid(out, out, chain.origin, o, 16 * i, 16 * i);
    const x = ax[3 * i],
      y = ax[3 * i + 1],
      z = ax[3 * i + 2];
    const a00 = out[o],
      a10 = out[o + 1],
      a20 = out[o + 2];
    const a01 = out[o + 4],
      a11 = out[o + 5],
      a21 = out[o + 6];
    const a02 = out[o + 8],
      a12 = out[o + 9],
      a22 = out[o + 10];
    if (chain.prismatic[i]) {
      // Translation along the axis: p += A_R·(axis·q); the rotation is unchanged.
      out[o + 12] += (a00 * x + a01 * y + a02 * z) * q;
      out[o + 13] += (a10 * x + a11 * y + a12 * z) * q;
      out[o + 14] += (a20 * x + a21 * y + a22 * z) * q;
      continue;
    }
    // Rotation about the axis, Rodrigues' formula R = I + sinθ[k]× + (1 − cosθ)[k]×² (Lynch & Park eq. 3.51);
    // A · R touches only A's rotation part (R has no translation).
    const c = Math.cos(q),
      sn = Math.sin(q),
      t = 1 - c;
    const m00 = t * x * x + c,
      m10 = t * x * y + sn * z,
      m20 = t * x * z - sn * y;
    const m01 = t * x * y - sn * z,
      m11 = t * y * y + c,
      m21 = t * y * z + sn * x;
    const m02 = t * x * z + sn * y,
      m12 = t * y * z - sn * x,
      m22 = t * z * z + c;
    out[o] = a00 * m00 + a01 * m10 + a02 * m20;
    out[o + 1] = a10 * m00 + a11 * m10 + a12 * m20;
    out[o + 2] = a20 * m00 + a21 * m10 + a22 * m20;
    out[o + 4] = a00 * m01 + a01 * m11 + a02 * m21;
    out[o + 5] = a10 * m01 + a11 * m11 + a12 * m21;
    out[o + 6] = a20 * m01 + a21 * m11 + a22 * m21;
    out[o + 8] = a00 * m02 + a01 * m12 + a02 * m22;
    out[o + 9] = a10 * m02 + a11 * m12 + a12 * m22;
    out[o + 10] = a20 * m02 + a21 * m12 + a22 * m22;
  }
  return out;
}

/**
 * Forward kinematics: fills `buffers.frames` with every link frame and `buffers.tool` with
 * the tool pose (tool = last link frame · tool offset); returns `buffers.tool`.
 */
export function forwardKinematics(
  chain: CompiledChain,
  pose: ArrayLike<number>,
  buffers: ChainBuffers,
  poseOffset = 0,
): Float64Array {
  linkFrames(chain, pose, buffers.frames, poseOffset);
  return mat4.multiplyRigid(buffers.tool, buffers.frames, chain.tool, 0, 16 * chain.jointCount, 0);
}

/**
 * Geometric Jacobian at the tool point in the base frame, from frames already computed by
 * {@link forwardKinematics}. Writes a 6×n row-major matrix into `out`: rows 0–2 linear
 * velocity, rows 3–5 angular velocity. Column i = [zᵢ × (p_tool − pᵢ); zᵢ] for a revolute
 * joint, [zᵢ; 0] for a prismatic joint (Siciliano et al., Robotics: Modelling, Planning and
 * Control, 2009, eq. 3.30).
 */
export function toolJacobian(chain: CompiledChain, buffers: ChainBuffers, out: Float64Array): Float64Array {
  const n = chain.jointCount;
  const f = buffers.frames;
  const t = buffers.tool;
  const px = t[12],
    py = t[13],
    pz = t[14];
  for (let i = 0; i < n; i++) {
    const o = 16 * (i + 1);
    const ax = chain.axis[3 * i],
      ay = chain.axis[3 * i + 1],
      az = chain.axis[3 * i + 2];
    // Axis in the base frame: the axis is fixed in the joint frame and invariant under its own motion.
    const zx = f[o] * ax + f[o + 4] * ay + f[o + 8] * az;
    const zy = f[o + 1] * ax + f[o + 5] * ay + f[o + 9] * az;
    const zz = f[o + 2] * ax + f[o + 6] * ay + f[o + 10] * az;
    if (chain.prismatic[i]) {
      out[i] = zx;
      out[n + i] = zy;
      out[2 * n + i] = zz;
      out[3 * n + i] = out[4 * n + i] = out[5 * n + i] = 0;
    } else {
      const rx = px - f[o + 12],
        ry = py - f[o + 13],
        rz = pz - f[o + 14];
      out[i] = zy * rz - zz * ry;
      out[n + i] = zz * rx - zx * rz;
      out[2 * n + i] = zx * ry - zy * rx;
      out[3 * n + i] = zx;
      out[4 * n + i] = zy;
      out[5 * n + i] = zz;
    }
  }
  return out;
}

/** The joint fields the chain needs from `arm.joints` (a plan arm or an arm description). */
export interface ChainJointLimits {
  name: string;
  type?: ChainJointType;
  min: number | null;
  max: number | null;
}

/** A plan-document arm with its chain, as produced by {@link armFromDescription}. */
export interface ArmWithChain {
  name: string;
  controlRateHz: number;
  cautionRatio: number;
  joints: {
    name: string;
    type: "revolute" | "prismatic";
    min: number;
    max: number;
    maxVelocity: number;
    maxAcceleration?: number;
    maxEffort?: number;
    friction?: { coulomb: number; viscous: number };
  }[];
  chain: ArmChain;
}

/** Travel that stands in for "no limit" when a continuous joint enters a plan arm (rad). */
export const CONTINUOUS_TRAVEL_RAD = 1e6;

/**
 * Turns an arm description (the URDF import result) into a plan-document `arm` with its
 * `chain`; a continuous joint becomes revolute with travel ±{@link CONTINUOUS_TRAVEL_RAD}.
 */
export function armFromDescription(desc: ArmDescription, controlRateHz = 1000): ArmWithChain {
  return {
    name: desc.name,
    controlRateHz,
    cautionRatio: 0.9,
    joints: desc.joints.map((j) => ({
      name: j.name,
      type: j.type === "prismatic" ? "prismatic" : "revolute",
      min: j.min ?? -CONTINUOUS_TRAVEL_RAD,
      max: j.max ?? CONTINUOUS_TRAVEL_RAD,
      maxVelocity: j.maxVelocity,
      ...(j.maxAcceleration !== undefined ? { maxAcceleration: j.maxAcceleration } : {}),
      ...(j.maxEffort !== undefined ? { maxEffort: j.maxEffort } : {}),
      ...(j.friction ? { friction: j.friction } : {}),
    })),
    chain: {
      base: desc.links[0] ?? { collision: [] },
      joints: desc.joints.map((j, i) => ({
        origin: j.origin,
        axis: j.axis,
        link: desc.links[i + 1] ?? { collision: [] },
      })),
      tool: desc.tool,
      gravity: desc.gravity,
    },
  };
}

/** Lower and upper travel of the chain joints (±Infinity where there is none). */
export function chainLimits(
  joints: readonly ChainJointLimits[],
  n: number,
): { lower: Float64Array; upper: Float64Array } {
  const lower = new Float64Array(n),
    upper = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const j = joints[i];
    lower[i] = j && j.min !== null && j.type !== "continuous" ? j.min : -Infinity;
    upper[i] = j && j.max !== null && j.type !== "continuous" ? j.max : Infinity;
  }
  return { lower, upper };
}
