/**
 * The motion engine: plan document, shapes, sampling, check, sequences, stream check and repair,
 * and the arm model (chain, kinematics, effort, clearance, tool speed, URDF and DH import).
 * Pure TypeScript, no Node-only APIs (it also runs in the browser).
 *
 * @module
 */
export * from "./plan/arm";
export * from "./plan/document";
export * from "./plan/problems";
export * from "./plan/unknown-fields";
export * from "./plan/targets";
export * from "./plan/parse";
export * from "./motion/shapes";
export * from "./check/report";
export * from "./motion/timeline";
export * from "./motion/peaks";
export * from "./check/check";
export * from "./motion/sample";
export * from "./motion/sequence";
export * from "./recordings/recording";
export * from "./recordings/stream-check";
export * from "./recordings/repair";
export * from "./recordings/scan";
export * from "./recordings/scan-stream";
export * from "./recordings/csv";
export * from "./recordings/timed-replay";
export * from "./recordings/dataset-repair";
export * from "./recordings/dataset-read";
export * from "./recordings/dataset-write";
export * from "./recordings/dataset-replay";
export * from "./check/wording";
// The arm model: chain, forward and inverse kinematics, DH and URDF import, the arm checks,
// dynamics, clearance and tool speed. All pure TypeScript; urdf uses fast-xml-parser, which runs
// in the browser.
export * from "./plan/arm-model";
export * from "./arm/mat4";
export * from "./arm/chain";
export * from "./arm/ik";
export * from "./arm/urdf";
export * from "./arm/dh";
export * from "./check/types";
export * from "./check/checkers";
export * from "./check/joint-checks";
export * from "./check/arm-state";
export * from "./check/effort";
export * from "./check/clearance";
export * from "./check/tool-speed";
export * from "./check/safe-duration";
export * from "./check/timing-sweep";
export * from "./check/work";
export * from "./arm/dynamics";
export * from "./arm/clearance";
export * from "./arm/tool-speed";
