"use client";
import { useMemo, useState } from "react";
import { Button } from "@/components/ui/button";
import { type ArmChain, compileChain, createChainBuffers, forwardKinematics, solveIk, type Joint } from "@/kinematics";
import { NumberInput } from "./number-input";

export interface CartesianGoalProps {
  chain: ArmChain;
  joints: readonly Joint[];
  /** The pose the solver starts from (the current goal), rad or m. */
  seed: readonly number[];
  onSolved: (pose: number[]) => void;
}

/**
 * Goal by tool-point position: x, y, z in millimetres in the arm's base frame, solved by the arm
 * model's inverse kinematics from the current goal, inside the joints' travel. When no pose reaches
 * the point, it says so and how far the closest pose stays away.
 */
export function CartesianGoal({ chain, joints, seed, onSolved }: CartesianGoalProps) {
  const compiled = useMemo(
    () =>
      compileChain(
        chain,
        joints.map((j) => j.type),
      ),
    [chain, joints],
  );
  const here = useMemo(() => {
    const t = forwardKinematics(compiled, seed, createChainBuffers(compiled));
    return [t[12] * 1000, t[13] * 1000, t[14] * 1000];
  }, [compiled, seed]);
  const [target, setTarget] = useState<number[] | null>(null);
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const xyz = target ?? here;

  const solve = () => {
    const result = solveIk(
      compiled,
      { position: [xyz[0] / 1000, xyz[1] / 1000, xyz[2] / 1000] },
      {
        seed,
        lower: joints.map((j) => j.min),
        upper: joints.map((j) => j.max),
      },
    );
    if (result.reachable) {
      onSolved(result.pose.slice(0, joints.length).concat(seed.slice(result.pose.length)));
      setTarget(null);
      setMessage({
        ok: true,
        text: `Solved: the tool point is within ${(result.positionErrorM * 1000).toFixed(2)} mm of the target.`,
      });
    } else {
      setMessage({
        ok: false,
        text: `Unreachable inside the joints' travel: the closest pose found stays ${(result.positionErrorM * 1000).toFixed(1)} mm away. The goal is unchanged.`,
      });
    }
  };

  return (
    <fieldset className="rounded-md border border-line p-2">
      <legend className="px-1 text-xs font-medium text-ink-soft">Goal by tool-point position (mm, base frame)</legend>
      <div className="grid grid-cols-[repeat(3,1fr)_auto] items-end gap-1.5">
        {(["x", "y", "z"] as const).map((axis, k) => (
          <label key={axis} className="flex flex-col text-[11px] text-ink-faint">
            {axis}
            <NumberInput
              value={xyz[k]}
              digits={1}
              aria-label={`Tool point ${axis} (mm)`}
              onValue={(v) => {
                const next = xyz.slice();
                next[k] = v;
                setTarget(next);
              }}
            />
          </label>
        ))}
        <Button size="sm" onClick={solve} className="h-8">
          Solve
        </Button>
      </div>
      {message ? (
        <p role="status" className={message.ok ? "mt-1.5 text-[11px] text-pass" : "mt-1.5 text-[11px] text-fault"}>
          {message.text}
        </p>
      ) : null}
    </fieldset>
  );
}
