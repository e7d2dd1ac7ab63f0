/**
 * The 3D view's own colours. The ghosts and the tool path are neutral or copper so that none can be
 * mistaken for a joint's colour (components/plots/joint-colors.ts) or for a verdict; a keep-out box
 * stays neutral until a clearance finding names it, then takes the fault colour.
 */
import { verdictLook } from "@/components/ui/verdict-chip";

/** Translucent copies of the arm at the start pose and at the selected move's goal. */
export const ghostColors = { start: "#9aa3ad", goal: "#5a5247" } as const;

/** The tool point's path and the marker at the tool tip (the playhead's copper). */
export const toolPathColor = "#b8612a";

/** Links driven by a joint with a finding. */
export const severityColors = { fault: verdictLook.fault.stroke, caution: "#d08a1a" } as const;

/** A keep-out box nothing touches, and one a clearance finding names. */
export const keepOutColors = {
  neutral: { fill: "#8d8778", edge: "#6f6a5e", opacity: 0.1 },
  touched: { fill: verdictLook.fault.stroke, edge: verdictLook.fault.stroke, opacity: 0.16 },
} as const;
