/** The plots' shared measures. */

/** Each chart's height: tall enough to read a trace against its limits (at least 120 px). */
export const PLOT_HEIGHT_PX = 128;
/** Limit and caution lines are drawn lighter than the traces, so a trace near a limit stays readable. */
export const LIMIT_LINE_OPACITY = 0.45;
export const LIMIT_LINE_WIDTH = 1;
export const TRACE_WIDTH = 1.75;
