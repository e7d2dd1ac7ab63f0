/**
 * Which keep-out boxes a plan's clearance findings name. A finding names its zone by the box's name
 * (or the engine's fallback name for an unnamed box, from `clearanceZones`); two boxes with the same
 * name are both marked, so a touched box is never drawn as clear.
 */
import { clearanceZones, type Finding, type KeepOutBox } from "@/kinematics";

export function touchedKeepOut(keepOut: readonly KeepOutBox[], findings: readonly Finding[]): boolean[] {
  const touched = new Set<string>();
  for (const f of findings)
    if (f.kind === "clearance" && "zone" in f && typeof f.zone === "string") touched.add(f.zone);
  return clearanceZones(0, [...keepOut]).boxNames.map((name) => touched.has(name));
}
