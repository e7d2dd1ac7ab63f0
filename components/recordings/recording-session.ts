/**
 * The recordings page's session: what is loaded, checked, repaired and about to be kept, as one
 * state and one reducer (pure, so the page's transitions can be tested without a browser).
 */
import type { Arm, Plan, Recording, Report, StreamReport } from "@/kinematics";

/** An arm the page can check a recording against: a built-in or project arm at one revision. */
export interface RecordingArm {
  id: string;
  name: string;
  revision: number;
  arm: Arm;
}

/** A file read and scanned against the chosen arm. */
export interface LoadedRecording {
  fileName: string;
  sizeBytes: number;
  recording: Recording;
  report: StreamReport;
  /** Wall time of the scan in the browser, ms. */
  checkMs: number;
}

/** The repaired (rate-limited) recording and its stream check. */
export interface RepairedRecording {
  recording: Recording;
  report: StreamReport;
  /** Largest departure from the original per joint, rad or m. */
  maxDeviation: number[];
}

/** The plan that would be saved from the repaired recording, with its check. */
export interface PlanPreview {
  plan: Plan;
  /** Moves lengthened to their shortest safe duration. */
  lengthened: number;
  report: Report;
}

/** Everything the page shows. */
export interface RecordingSession {
  armId: string;
  /** Reading progress 0..1, `null` before a file is chosen. */
  progress: number | null;
  /** Why the last file was refused, one line each (named by the file's lines). */
  problems: string[];
  loaded: LoadedRecording | null;
  repaired: RepairedRecording | null;
  planPreview: PlanPreview | null;
  /** Joint shown in the plot (index in the arm's order). */
  joint: number;
  planName: string;
  /** Waypoint spacing of the plan made from the repaired recording, s. */
  spacingS: number;
  exporting: boolean;
  /** The file chosen last (kept for the upload). */
  file: File | null;
  /** Upload progress 0..1, `null` before an upload starts. */
  uploadProgress: number | null;
}

/** What can happen on the page. */
export type SessionAction =
  | { type: "choose-arm"; armId: string }
  | { type: "read-start"; file: File }
  | { type: "read-progress"; fraction: number }
  | { type: "refused"; problems: string[] }
  | { type: "loaded"; loaded: LoadedRecording }
  | { type: "repaired"; repaired: RepairedRecording; planPreview: PlanPreview }
  | { type: "show-joint"; joint: number }
  | { type: "plan-name"; name: string }
  | { type: "spacing"; spacingS: number; planPreview: PlanPreview | null }
  | { type: "exporting"; open: boolean }
  | { type: "upload-progress"; fraction: number | null };

/** The session before anything is chosen. */
export function initialSession(armId: string): RecordingSession {
  return {
    armId,
    progress: null,
    problems: [],
    loaded: null,
    repaired: null,
    planPreview: null,
    joint: 0,
    planName: "",
    spacingS: 0.5,
    exporting: false,
    file: null,
    uploadProgress: null,
  };
}

/** The one reducer of the recordings page. */
export function sessionReducer(state: RecordingSession, action: SessionAction): RecordingSession {
  switch (action.type) {
    case "choose-arm":
      // a check against another arm says nothing about this one: drop every result
      return { ...state, armId: action.armId, loaded: null, repaired: null, planPreview: null };
    case "read-start":
      return {
        ...state,
        problems: [],
        loaded: null,
        repaired: null,
        planPreview: null,
        progress: 0,
        file: action.file,
        uploadProgress: null,
      };
    case "read-progress":
      return { ...state, progress: action.fraction };
    case "refused":
      return { ...state, problems: action.problems, loaded: null };
    case "loaded": {
      const { report, fileName } = action.loaded;
      const worst = report.findings.find((f) => f.severity === "fault") ?? report.findings[0];
      return {
        ...state,
        loaded: action.loaded,
        joint: worst?.joint ?? 0,
        planName: fileName.replace(/\.csv$/i, "").slice(0, 100) + " (repaired)",
      };
    }
    case "repaired":
      return { ...state, repaired: action.repaired, planPreview: action.planPreview };
    case "show-joint":
      return { ...state, joint: action.joint };
    case "plan-name":
      return { ...state, planName: action.name };
    case "spacing":
      return { ...state, spacingS: action.spacingS, planPreview: action.planPreview };
    case "exporting":
      return { ...state, exporting: action.open };
    case "upload-progress":
      return { ...state, uploadProgress: action.fraction };
  }
}
