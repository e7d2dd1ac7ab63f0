"use client";
import dynamic from "next/dynamic";
import { useMemo } from "react";
import { Skeleton } from "@/components/ui/skeleton";
import { Playhead, PlayheadContext } from "@/components/editor/playhead";
import { StageErrorBoundary } from "@/components/viewer/error-boundary";
import { schematicChain } from "@/components/viewer/schematic-chain";
import { homePose, type Arm, timelineOf } from "@/kinematics";

const Stage = dynamic(() => import("@/components/viewer/stage"), {
  ssr: false,
  loading: () => <Skeleton className="h-full w-full rounded-none" />,
});

/** An arm at rest in the 3D view (its home pose), for the arms page. */
export function ArmStage({ arm }: { arm: Arm }) {
  const playhead = useMemo(() => new Playhead(), []);
  const home = useMemo(() => homePose(arm), [arm]);
  const timeline = useMemo(
    () => timelineOf({ format: "jointproof.plan", version: 1, arm, start: home, moves: [] }),
    [arm, home],
  );
  const chain = useMemo(() => arm.chain ?? schematicChain(arm.joints), [arm]);
  return (
    <PlayheadContext.Provider value={playhead}>
      <div className="relative h-80 overflow-hidden rounded-md bg-[#f3f1ea]" data-testid="arm-stage">
        <StageErrorBoundary>
          <Stage chain={chain} joints={arm.joints} timeline={timeline} ghosts={[]} linkSeverity={[]} />
        </StageErrorBoundary>
        {!arm.chain ? (
          <span className="absolute top-2 left-2 rounded bg-caution-tint px-1.5 py-0.5 text-[11px] text-caution">
            Schematic: this description has no geometry
          </span>
        ) : null}
      </div>
    </PlayheadContext.Provider>
  );
}
