/**
 * The motion engine: plan document, shapes, sampling, check, sequences, stream check and repair,
 * and the arm model (chain, kinematics, effort, clearance, tool speed, URDF and DH import).
 * Pure TypeScript, no Node-only APIs (it also runs in the browser).
 *
 * @module
 */
export * from "./plan";
export * from "./shapes";
export * from "./report";
export * from "./timeline";
export * from "./peaks";
export * from "./check";
export * from "./sample";
export * from "./sequence";
export * from "./stream";
export * from "./csv";
export * from "./wording";
// The arm model (issue 4): chain, forward and inverse kinematics, DH and URDF import, the arm
// checks, dynamics, clearance and tool speed. All pure TypeScript; urdf uses fast-xml-parser,
// which runs in the browser.
export * from "./arm-model";
export * from "./mat4";
export * from "./chain";
export * from "./ik";
export * from "./urdf";
export * from "./dh";
export * from "./arm-checks";
export * from "./dynamics";
export * from "./clearance";
export * from "./toolspeed";
