/**
 * 4×4 rigid-transform helpers in the gl-matrix style: column-major `Float64Array`s,
 * `out` first, an optional element offset per matrix so that many frames can share one
 * flat buffer, return `out`. Nothing here allocates.
 *
 * Element (row r, column c) of the matrix at offset o is `m[o + 4 * c + r]` — the same
 * layout as gl-matrix and three.js `Matrix4.elements`.
 *
 * @module
 */

/** A 3-vector given as a plain tuple or array (metres or radians, per use). */
export type Vec3Like = ArrayLike<number>;

/** Allocates a new identity matrix (use at set-up time, never per sample). */
export function create(): Float64Array {
  const m = new Float64Array(16);
  m[0] = m[5] = m[10] = m[15] = 1;
  return m;
}

/** Writes the identity into `out` at offset `o`. */
export function identity(out: Float64Array, o = 0): Float64Array {
  for (let i = 0; i < 16; i++) out[o + i] = 0;
  out[o] = out[o + 5] = out[o + 10] = out[o + 15] = 1;
  return out;
}

/** Copies the matrix at `a[ao]` into `out[o]`. */
export function copy(out: Float64Array, a: ArrayLike<number>, o = 0, ao = 0): Float64Array {
  for (let i = 0; i < 16; i++) out[o + i] = a[ao + i];
  return out;
}

/**
 * out = a · b (general 4×4 product; `out` may alias `a` or `b`).
 * Column-major product: (a·b)[r,c] = Σₖ a[r,k]·b[k,c].
 */
export function multiply(
  out: Float64Array,
  a: ArrayLike<number>,
  b: ArrayLike<number>,
  o = 0,
  ao = 0,
  bo = 0,
): Float64Array {
  const a00 = a[ao],
    a10 = a[ao + 1],
    a20 = a[ao + 2],
    a30 = a[ao + 3];
  const a01 = a[ao + 4],
    a11 = a[ao + 5],
    a21 = a[ao + 6],
    a31 = a[ao + 7];
  const a02 = a[ao + 8],
    a12 = a[ao + 9],
    a22 = a[ao + 10],
    a32 = a[ao + 11];
  const a03 = a[ao + 12],
    a13 = a[ao + 13],
    a23 = a[ao + 14],
    a33 = a[ao + 15];
  for (let c = 0; c < 4; c++) {
    const b0 = b[bo + 4 * c],
      b1 = b[bo + 4 * c + 1],
      b2 = b[bo + 4 * c + 2],
      b3 = b[bo + 4 * c + 3];
    out[o + 4 * c] = a00 * b0 + a01 * b1 + a02 * b2 + a03 * b3;
    out[o + 4 * c + 1] = a10 * b0 + a11 * b1 + a12 * b2 + a13 * b3;
    out[o + 4 * c + 2] = a20 * b0 + a21 * b1 + a22 * b2 + a23 * b3;
    out[o + 4 * c + 3] = a30 * b0 + a31 * b1 + a32 * b2 + a33 * b3;
  }
  return out;
}

/**
 * out = a · b for rigid transforms (bottom rows 0 0 0 1): the 3×4 part only, 36 multiply-adds
 * instead of 64; `out` may alias `a` or `b`. A deliberate specialisation of {@link multiply} for the
 * chain's hot loops, so the two read alike.
 */
export function multiplyRigid(
  out: Float64Array,
  a: ArrayLike<number>,
  b: ArrayLike<number>,
  o = 0,
  ao = 0,
  bo = 0,
): Float64Array {
  const a00 = a[ao],
    a10 = a[ao + 1],
    a20 = a[ao + 2];
  const a01 = a[ao + 4],
    a11 = a[ao + 5],
    a21 = a[ao + 6];
  const a02 = a[ao + 8],
    a12 = a[ao + 9],
    a22 = a[ao + 10];
  const a03 = a[ao + 12],
    a13 = a[ao + 13],
    a23 = a[ao + 14];
  for (let c = 0; c < 4; c++) {
    const b0 = b[bo + 4 * c],
      b1 = b[bo + 4 * c + 1],
      b2 = b[bo + 4 * c + 2];
    const w = c === 3 ? 1 : 0; // b's bottom row is (0, 0, 0, 1)
    out[o + 4 * c] = a00 * b0 + a01 * b1 + a02 * b2 + a03 * w;
    out[o + 4 * c + 1] = a10 * b0 + a11 * b1 + a12 * b2 + a13 * w;
    out[o + 4 * c + 2] = a20 * b0 + a21 * b1 + a22 * b2 + a23 * w;
    out[o + 4 * c + 3] = w;
  }
  return out;
}

/**
 * Rigid transform from a translation `xyz` (m) and fixed-axis roll/pitch/yaw `rpy` (rad).
 * R = Rz(yaw)·Ry(pitch)·Rx(roll) — URDF XML specification, `<origin>` element.
 */
export function fromXyzRpy(out: Float64Array, xyz: Vec3Like, rpy: Vec3Like, o = 0): Float64Array {
  const cr = Math.cos(rpy[0]),
    sr = Math.sin(rpy[0]);
  const cp = Math.cos(rpy[1]),
    sp = Math.sin(rpy[1]);
  const cy = Math.cos(rpy[2]),
    sy = Math.sin(rpy[2]);
  // Expanded Rz(y)·Ry(p)·Rx(r) (derived by multiplying the three elementary rotations).
  out[o] = cy * cp;
  out[o + 1] = sy * cp;
  out[o + 2] = -sp;
  out[o + 3] = 0;
  out[o + 4] = cy * sp * sr - sy * cr;
  out[o + 5] = sy * sp * sr + cy * cr;
  out[o + 6] = cp * sr;
  out[o + 7] = 0;
  out[o + 8] = cy * sp * cr + sy * sr;
  out[o + 9] = sy * sp * cr - cy * sr;
  out[o + 10] = cp * cr;
  out[o + 11] = 0;
  out[o + 12] = xyz[0];
  out[o + 13] = xyz[1];
  out[o + 14] = xyz[2];
  out[o + 15] = 1;
  return out;
}

/**
 * Reads fixed-axis roll/pitch/yaw (rad) from the rotation part of `m`, inverse of
 * {@link fromXyzRpy}. At pitch = ±π/2 (gimbal lock) roll is set to 0 and yaw absorbs the
 * remaining rotation, so that `fromXyzRpy` rebuilds the same matrix.
 */
export function toRpy(out: Float64Array | number[], m: ArrayLike<number>, mo = 0): Float64Array | number[] {
  const r00 = m[mo],
    r10 = m[mo + 1],
    r20 = m[mo + 2];
  const r21 = m[mo + 6],
    r22 = m[mo + 10];
  // pitch = asin(−r20), clamped before asin (guarded maths).
  const sp = Math.max(-1, Math.min(1, -r20));
  const pitch = Math.asin(sp);
  const cp = Math.hypot(r00, r10);
  if (cp > 1e-9) {
    out[0] = Math.atan2(r21, r22); // roll = atan2(r21, r22) (derived from fromXyzRpy)
    out[1] = pitch;
    out[2] = Math.atan2(r10, r00); // yaw = atan2(r10, r00)
  } else {
    // Gimbal lock: with roll = 0, column 1 is (−sy, cy, 0), so yaw = atan2(−r01, r11).
    out[0] = 0;
    out[1] = sp > 0 ? Math.PI / 2 : -Math.PI / 2;
    out[2] = Math.atan2(-m[mo + 4], m[mo + 5]);
  }
  return out;
}

/**
 * Rotation by `angleRad` about the unit `axis`, translation zero.
 * Rodrigues' formula R = I + sinθ·[k]× + (1 − cosθ)·[k]×² (Lynch & Park, Modern Robotics, eq. 3.51).
 * The axis is assumed to be of unit length (the chain compiler normalises it).
 */
export function fromAxisAngle(out: Float64Array, axis: Vec3Like, angleRad: number, o = 0, ax = 0): Float64Array {
  const x = axis[ax],
    y = axis[ax + 1],
    z = axis[ax + 2];
  const c = Math.cos(angleRad),
    s = Math.sin(angleRad),
    t = 1 - c;
  out[o] = t * x * x + c;
  out[o + 1] = t * x * y + s * z;
  out[o + 2] = t * x * z - s * y;
  out[o + 3] = 0;
  out[o + 4] = t * x * y - s * z;
  out[o + 5] = t * y * y + c;
  out[o + 6] = t * y * z + s * x;
  out[o + 7] = 0;
  out[o + 8] = t * x * z + s * y;
  out[o + 9] = t * y * z - s * x;
  out[o + 10] = t * z * z + c;
  out[o + 11] = 0;
  out[o + 12] = 0;
  out[o + 13] = 0;
  out[o + 14] = 0;
  out[o + 15] = 1;
  return out;
}

/** Pure translation by `d` (m) along the unit `axis`. */
export function fromAxisTranslation(out: Float64Array, axis: Vec3Like, d: number, o = 0, ax = 0): Float64Array {
  identity(out, o);
  out[o + 12] = axis[ax] * d;
  out[o + 13] = axis[ax + 1] * d;
  out[o + 14] = axis[ax + 2] * d;
  return out;
}

/** Rotation about x by `angleRad` (elementary rotation, any kinematics text). */
export function fromRotationX(out: Float64Array, angleRad: number, o = 0): Float64Array {
  identity(out, o);
  const c = Math.cos(angleRad),
    s = Math.sin(angleRad);
  out[o + 5] = c;
  out[o + 6] = s;
  out[o + 9] = -s;
  out[o + 10] = c;
  return out;
}

/** Rotation about z by `angleRad` (elementary rotation, any kinematics text). */
export function fromRotationZ(out: Float64Array, angleRad: number, o = 0): Float64Array {
  identity(out, o);
  const c = Math.cos(angleRad),
    s = Math.sin(angleRad);
  out[o] = c;
  out[o + 1] = s;
  out[o + 4] = -s;
  out[o + 5] = c;
  return out;
}

/** Pure translation by (x, y, z) metres. */
export function fromTranslation(out: Float64Array, x: number, y: number, z: number, o = 0): Float64Array {
  identity(out, o);
  out[o + 12] = x;
  out[o + 13] = y;
  out[o + 14] = z;
  return out;
}

/**
 * Inverse of a rigid transform: [Rᵀ, −Rᵀp] (Lynch & Park, Modern Robotics, prop. 3.15).
 * Only valid for rotation + translation matrices; `out` must not alias `m`.
 */
export function invertRigid(out: Float64Array, m: ArrayLike<number>, o = 0, mo = 0): Float64Array {
  for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) out[o + 4 * c + r] = m[mo + 4 * r + c];
  const px = m[mo + 12],
    py = m[mo + 13],
    pz = m[mo + 14];
  out[o + 3] = out[o + 7] = out[o + 11] = 0;
  out[o + 12] = -(out[o] * px + out[o + 4] * py + out[o + 8] * pz);
  out[o + 13] = -(out[o + 1] * px + out[o + 5] * py + out[o + 9] * pz);
  out[o + 14] = -(out[o + 2] * px + out[o + 6] * py + out[o + 10] * pz);
  out[o + 15] = 1;
  return out;
}

/** out = m · (p, 1): transforms a point (m); writes 3 values at `out[oo]`. */
export function transformPoint(
  out: Float64Array | number[],
  m: ArrayLike<number>,
  p: ArrayLike<number>,
  oo = 0,
  mo = 0,
  po = 0,
): Float64Array | number[] {
  const x = p[po],
    y = p[po + 1],
    z = p[po + 2];
  out[oo] = m[mo] * x + m[mo + 4] * y + m[mo + 8] * z + m[mo + 12];
  out[oo + 1] = m[mo + 1] * x + m[mo + 5] * y + m[mo + 9] * z + m[mo + 13];
  out[oo + 2] = m[mo + 2] * x + m[mo + 6] * y + m[mo + 10] * z + m[mo + 14];
  return out;
}

/** out = R · v: rotates a direction by the rotation part of `m`; writes 3 values at `out[oo]`. */
export function rotateVector(
  out: Float64Array | number[],
  m: ArrayLike<number>,
  v: ArrayLike<number>,
  oo = 0,
  mo = 0,
  vo = 0,
): Float64Array | number[] {
  const x = v[vo],
    y = v[vo + 1],
    z = v[vo + 2];
  out[oo] = m[mo] * x + m[mo + 4] * y + m[mo + 8] * z;
  out[oo + 1] = m[mo + 1] * x + m[mo + 5] * y + m[mo + 9] * z;
  out[oo + 2] = m[mo + 2] * x + m[mo + 6] * y + m[mo + 10] * z;
  return out;
}

/** Rotation part of `m` as three row arrays (for JSON output; allocates). */
export function rotationRows(m: ArrayLike<number>, mo = 0): number[][] {
  return [0, 1, 2].map((r) => [m[mo + r], m[mo + 4 + r], m[mo + 8 + r]]);
}
