/**
 * Which links of the 3D view's arm to tint, move by move: a joint's finding tints the link that joint
 * drives; a clearance finding tints the link the engine names (`Finding.link`).
 */
import type { ArmChain, MoveReport } from "@/kinematics";

export type LinkSeverity = ("caution" | "fault" | null)[];

/** Per move, per link (0 = the base): the worst severity among the move's findings on that link. */
export function linkSeverityOf(moves: readonly MoveReport[], chain: ArmChain): LinkSeverity[] {
  const links = chain.joints.length + 1;
  const byName = new Map<string, number>();
  if (chain.base.name) byName.set(chain.base.name, 0);
  chain.joints.forEach((j, i) => {
    if (j.link.name) byName.set(j.link.name, i + 1);
  });
  return moves.map((m) => {
    const row: LinkSeverity = new Array(links).fill(null);
    for (const f of m.findings) {
      const k = f.link !== undefined ? byName.get(f.link) : f.joint !== null ? f.joint + 1 : undefined;
      if (k === undefined || k >= links) continue;
      if (row[k] !== "fault") row[k] = f.severity;
    }
    return row;
  });
}
