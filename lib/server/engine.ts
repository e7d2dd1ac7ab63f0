/**
 * The API's one doorway into the motion engine (kinematics/): the plan-document schema, the
 * check, sampling and the readers. Kept in one file so the engine's layout can change with one edit.
 */
export { armDocumentSchema, armSchema, check, parsePlan, planFormat, planSchema, planVersion, samplePlan, shortestSafeDurations, scaleToPass, parseRecordingCsv, alignRecording, streamCheck } from "@/kinematics";
export type { Arm, Finding, Plan, Report, Samples, Verdict } from "@/kinematics";
export { parseUrdf } from "@/kinematics";
export { armFromDescription } from "@/kinematics";
