import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { armChainSchema, type ArmChainInput } from "@/kinematics/plan/arm-model";
import { compileChain, type ChainJointType } from "@/kinematics/arm/chain";

/** Repo-relative path to an absolute one. */
export function repoPath(rel: string): string {
  return fileURLToPath(new URL(`../../../../${rel}`, import.meta.url));
}

/** Reads a JSON file from the repo. */
export function readJson(rel: string): unknown {
  return JSON.parse(readFileSync(repoPath(rel), "utf8"));
}

/** Parses and compiles a chain written as a document fragment. */
export function compile(chain: ArmChainInput, types: ChainJointType[] = []) {
  return compileChain(armChainSchema.parse(chain), types);
}
