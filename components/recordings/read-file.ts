/** Reads a file's bytes through its stream, reporting progress (0..1) as chunks arrive. */
export async function readWithProgress(file: Blob, onProgress: (fraction: number) => void): Promise<Uint8Array> {
  const total = file.size;
  if (typeof file.stream !== "function") {
    const buf = new Uint8Array(await file.arrayBuffer());
    onProgress(1);
    return buf;
  }
  const out = new Uint8Array(total);
  const reader = file.stream().getReader();
  let offset = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    out.set(value, offset);
    offset += value.length;
    onProgress(total > 0 ? offset / total : 1);
  }
  onProgress(1);
  return offset === total ? out : out.subarray(0, offset);
}

/** Picks waypoints from a recording every `stepS` seconds (plus the last sample), by index. */
export function waypointIndices(timeS: Float64Array, stepS: number): number[] {
  const out: number[] = [];
  if (timeS.length === 0) return out;
  let next = timeS[0];
  for (let k = 0; k < timeS.length; k++) {
    if (timeS[k] >= next - 1e-12) {
      out.push(k);
      next = timeS[k] + stepS;
    }
  }
  if (out[out.length - 1] !== timeS.length - 1) out.push(timeS.length - 1);
  return out;
}
