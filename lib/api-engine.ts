/**
 * The API's one doorway into the motion engine (kinematics/): the plan-document schema, the
 * check, sampling and the recording and URDF readers. Kept in one file so the engine's module
 * layout can change with one edit here.
 */
export { armDocumentSchema, armSchema, planFormat, planSchema, planVersion, type Arm, type Plan } from "@/kinematics/plan";
export { check } from "@/kinematics/check";
export type { Finding, Report, Verdict } from "@/kinematics/report";
export { samplePlan, type Samples } from "@/kinematics/sample";
