/**
 * The stored form of a repaired episode (dataset_episodes.repaired): a little-endian header of two
 * uint32 (frame count n, joint count J), then n float64 times, n·J float64 positions (frame-major)
 * and n bytes marking frames filled by the repair (1) or recorded (0).
 */
import type { Recording } from "@/kinematics";

export interface StoredEpisode {
  recording: Recording;
  filled: Uint8Array;
}

export function encodeEpisode(recording: Recording, filled: Uint8Array): Buffer {
  const { count, jointCount } = recording;
  const out = Buffer.alloc(8 + count * 8 + count * jointCount * 8 + count);
  out.writeUInt32LE(count, 0);
  out.writeUInt32LE(jointCount, 4);
  let o = 8;
  for (let k = 0; k < count; k++, o += 8) out.writeDoubleLE(recording.timeS[k], o);
  for (let i = 0; i < count * jointCount; i++, o += 8) out.writeDoubleLE(recording.position[i], o);
  for (let k = 0; k < count; k++) out[o + k] = filled[k] ?? 0;
  return out;
}

export function decodeEpisode(bytes: Uint8Array, names: string[]): StoredEpisode {
  const buf = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const count = buf.readUInt32LE(0);
  const jointCount = buf.readUInt32LE(4);
  const timeS = new Float64Array(count);
  const position = new Float64Array(count * jointCount);
  let o = 8;
  for (let k = 0; k < count; k++, o += 8) timeS[k] = buf.readDoubleLE(o);
  for (let i = 0; i < count * jointCount; i++, o += 8) position[i] = buf.readDoubleLE(o);
  const filled = Uint8Array.from(buf.subarray(o, o + count));
  return { recording: { names, jointCount, count, timeS, position }, filled };
}
