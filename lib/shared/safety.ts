/**
 * The safety caution, in one place, shown wherever a plan leaves Jointproof:
 * exports, copied commands, the API reference, the README (which carries its own copy).
 */
export const SAFETY_SHORT =
  "A passing check is a prediction from a model of the arm, not a promise that a motion is safe.";

export const SAFETY_POINTS: readonly string[] = [
  "Clamp the arm firmly to its table before it moves.",
  "Clear the workspace of people and loose objects.",
  "Keep the emergency stop within reach for every run.",
  "Run every new plan first at reduced speed.",
  "Make sure the arm model matches the hardware, including the tool it carries: the two tool variants weigh differently.",
  "Follow your lab's safety rules, the arm maker's instructions, the applicable standards (such as ISO 10218 for robot safety) and local codes; they take precedence over anything Jointproof says.",
];

export const SAFETY_TEXT = `${SAFETY_SHORT} Jointproof predicts controller faults and collisions; it cannot see the real arm. Before running a plan on hardware: ${SAFETY_POINTS.join(" ")}`;
