/**
 * The motion engine: plan document, shapes, sampling, check, sequences, stream check and repair.
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
