"use client";
import { Button } from "@/components/ui/button";
import { PauseIcon, PlayIcon } from "@/components/ui/icons";
import { usePlayhead, usePlayheadStore } from "./playhead";

/** Play / pause and the scrubber along the plan's timeline, with the time as numbers. */
export function Transport() {
  const p = usePlayheadStore();
  const { timeS, playing, totalS } = usePlayhead();
  return (
    <div className="flex shrink-0 items-center gap-2 border-t border-line bg-panel px-3 py-1.5">
      <Button
        size="sm"
        variant="primary"
        onClick={() => p.toggle()}
        aria-label={playing ? "Pause" : "Play"}
        disabled={totalS <= 0}
      >
        {playing ? <PauseIcon size={12} /> : <PlayIcon size={12} />}
        {playing ? "Pause" : "Play"}
      </Button>
      <input
        type="range"
        aria-label="Time on the plan's timeline"
        min={0}
        max={Math.max(totalS, 0.001)}
        step={0.001}
        value={timeS}
        aria-valuetext={`${timeS.toFixed(3)} of ${totalS.toFixed(3)} seconds`}
        onChange={(e) => p.seek(Number(e.target.value))}
        className="h-4 flex-1 accent-copper-500"
      />
      <span className="tabular w-32 text-right font-mono text-xs text-ink-soft" data-testid="playhead-time">
        {timeS.toFixed(3)} / {totalS.toFixed(3)} s
      </span>
    </div>
  );
}
