/**
 * A stand-in chain for arms whose description has no geometry (`arm.chain`): a plain upright
 * schematic with alternating vertical and horizontal axes, so the 3D view can still show how the joints
 * move. The 3D view labels it as a schematic; it is never used for clearance or effort.
 */
import type { ArmChain, Joint } from "@/kinematics";

const AXES: [number, number, number][] = [
  [0, 0, 1],
  [0, 1, 0],
  [0, 1, 0],
  [0, 1, 0],
  [0, 0, 1],
  [0, 1, 0],
];
const LENGTHS = [0.1, 0.09, 0.28, 0.24, 0.07, 0.06];

export function schematicChain(joints: readonly Joint[]): ArmChain {
  const count = Math.min(joints.filter((j) => j.type === "revolute").length, 6) || 1;
  const chainJoints: ArmChain["joints"] = [];
  for (let i = 0; i < count; i++) {
    const next = LENGTHS[i + 1] ?? 0.05;
    chainJoints.push({
      origin: { xyz: [0, 0, LENGTHS[i]], rpy: [0, 0, 0] },
      axis: AXES[i],
      link: {
        name: joints[i]?.name ?? `link${i + 1}`,
        collision: [{ kind: "capsule", from: [0, 0, 0], to: [0, 0, next], radius: 0.035 - i * 0.003 }],
      },
    });
  }
  return {
    base: {
      name: "base",
      collision: [{ kind: "box", center: [0, 0, 0.04], size: [0.14, 0.14, 0.08], rpy: [0, 0, 0] }],
    },
    joints: chainJoints,
    tool: { xyz: [0, 0, 0.1], rpy: [0, 0, 0] },
    gravity: [0, 0, -9.81],
  };
}
