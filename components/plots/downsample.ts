import { sampleTimeline, type Samples, type Timeline } from "@/kinematics";

/**
 * Downsampling for drawing: a min–max bucket reduction over sample indices. The timeline is cut into
 * `buckets` equal-count buckets; in each, the indices of every series' minimum and maximum are kept
 * (plus the first and last sample), so peaks, limit crossings and steps survive while a 60-second
 * 1 kHz plan draws with a few thousand points. Returns sorted, unique sample indices.
 */
export function minMaxIndices(
  count: number,
  values: Float64Array,
  stride: number,
  columns: readonly number[],
  buckets: number,
): Uint32Array {
  if (count <= 0) return new Uint32Array(0);
  if (count <= buckets * 2 || columns.length === 0) {
    const all = new Uint32Array(count);
    for (let k = 0; k < count; k++) all[k] = k;
    return all;
  }
  const keep = new Uint8Array(count);
  keep[0] = 1;
  keep[count - 1] = 1;
  const size = count / buckets;
  for (let b = 0; b < buckets; b++) {
    const lo = Math.floor(b * size);
    const hi = Math.min(count, Math.floor((b + 1) * size));
    for (const c of columns) {
      let minK = lo;
      let maxK = lo;
      let minV = values[lo * stride + c];
      let maxV = minV;
      for (let k = lo + 1; k < hi; k++) {
        const v = values[k * stride + c];
        if (v < minV) {
          minV = v;
          minK = k;
        } else if (v > maxV) {
          maxV = v;
          maxK = k;
        }
      }
      keep[minK] = 1;
      keep[maxK] = 1;
    }
  }
  let n = 0;
  for (let k = 0; k < count; k++) n += keep[k];
  const out = new Uint32Array(n);
  let w = 0;
  for (let k = 0; k < count; k++) if (keep[k]) out[w++] = k;
  return out;
}

/** A sampling rate for plots: the control rate, lowered so that a long plan stays under `maxSamples`. */
export function plotRateHz(controlRateHz: number, totalS: number, maxSamples = 30_000): number {
  if (!(totalS > 0)) return controlRateHz;
  return Math.min(controlRateHz, maxSamples / totalS);
}

/** The samples the plots draw: the timeline at {@link plotRateHz} (the live check and the effort worker agree on it). */
export function plotSamples(timeline: Timeline, controlRateHz: number): Samples {
  return sampleTimeline(timeline, plotRateHz(controlRateHz, timeline.totalS));
}
