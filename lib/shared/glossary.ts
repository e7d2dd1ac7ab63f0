/**
 * One-line hints for the words a student will not know, shown beside the word where it appears
 * (a `title`, a hint line under a field, a help popover). The contributor guide's glossary
 * (DEVELOPERS.md) holds the same words with the rest of the vocabulary; keep the two in step.
 * Formulas: rest-to-rest time scalings, Lynch & Park, Modern Robotics (2017), §9.2.1 (cubic,
 * quintic); trapezoid, Nagarajan, Introduction to Industrial Robotics (2016), eqs. 10.26–10.28.
 */

export type HintTerm = "cautionRatio" | "cubic" | "quintic" | "trapezoid" | "controlPeriod" | "durationSweep";

export interface Hint {
  /** The word as the screens show it. */
  label: string;
  /** One sentence a first-year student can act on. */
  hint: string;
}

export const HINTS: Readonly<Record<HintTerm, Hint>> = {
  cautionRatio: {
    label: "caution ratio",
    hint: "The share of a limit above which a value is a caution rather than a pass: with 0.9, a joint at 92% of its top speed is a caution.",
  },
  cubic: {
    label: "cubic",
    hint: "Starts and stops at rest with the smallest peak speed (1.5 × the average), but the acceleration jumps at both ends.",
  },
  quintic: {
    label: "quintic",
    hint: "Starts and stops at rest with no jump in acceleration, so it is gentler on the arm; its peak speed is 1.875 × the average.",
  },
  trapezoid: {
    label: "trapezoid",
    hint: "Accelerates evenly, cruises at a steady speed, then slows evenly: speed over time looks like a trapezoid.",
  },
  controlPeriod: {
    label: "control period",
    hint: "The time between two updates of the arm's controller, 1 ÷ the control rate: 1 ms at 1000 Hz. An instant move must fit in one period.",
  },
  durationSweep: {
    label: "duration sweep",
    hint: "The same move checked at a range of durations, to see how much margin each limit keeps as the move gets shorter.",
  },
};

/** The hint sentence for a term. */
export function hintFor(term: HintTerm): string {
  return HINTS[term].hint;
}

/** The hint for a move shape, or undefined for a shape without one. */
export function shapeHint(shape: string): string | undefined {
  return shape === "cubic" || shape === "quintic" || shape === "trapezoid" ? HINTS[shape].hint : undefined;
}
