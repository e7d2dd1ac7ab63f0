/**
 * One colour per joint, the same in the plots, the legend and the 3D view's highlights. Chosen to
 * stay well apart from the verdict colours (green, amber, red: pass, caution and fault everywhere),
 * from the 3D view's start and goal ghosts and from the copper tool path and playhead
 * (components/viewer/colors.ts); tests/unit/components/palette.test.ts holds them apart.
 */
export const jointColors = ["#1f6f86", "#6d4bc3", "#b0306a", "#475569", "#0f8fa8", "#3f5fbf", "#c85ab4", "#22307a"];

export function jointColor(j: number): string {
  return jointColors[j % jointColors.length];
}
