/**
 * One colour per joint, the same in the plots, the legend and the stage's highlights. Chosen to stay
 * apart from the verdict colours (green, amber, red), which mean pass, caution and fault everywhere.
 */
export const jointColors = ["#1f6f86", "#6d4bc3", "#b0306a", "#475569", "#0f8fa8", "#8a6d1f", "#3f5fbf", "#9a4f21"];

export function jointColor(j: number): string {
  return jointColors[j % jointColors.length];
}
