"use client";
import { memo, useCallback, useLayoutEffect, useRef, useState, type KeyboardEvent } from "react";
import { Button } from "@/components/ui/button";
import { cn } from "@/components/ui/cn";
import { CopyIcon, DownIcon, PlusIcon, TrashIcon, UpIcon } from "@/components/ui/icons";
import { Table, Td, Th } from "@/components/ui/table";
import { VerdictChip } from "@/components/ui/verdict-chip";
import {
  moveLabel,
  moveNumber,
  shapeNames,
  type Joint,
  type Move,
  type ShapeName,
  verdictOf,
  type MoveReport,
  type Verdict,
} from "@/kinematics";
import { toDisplay, unitLabel, type AngleUnit } from "@/lib/shared/units";
import { moveFigures } from "./move-figures";
import { NumberInput } from "./number-input";
import type { PlanAction, PoseTarget } from "./plan-state";
import type { QuickFix } from "./quick-fixes";

export interface MoveListProps {
  joints: readonly Joint[];
  /** The plan's start pose (rad or m), to summarise what the first move changes. */
  startPose: readonly number[];
  moves: readonly Move[];
  /** The live report's per-move figures, index-aligned with `moves` (may lag by one edit). */
  reports: readonly MoveReport[];
  unit: AngleUnit;
  selected: PoseTarget;
  onSelect: (target: PoseTarget) => void;
  dispatch: (action: PlanAction) => void;
  /** Verdict of the start pose (its range and effort findings); `null` shows no chip. */
  startVerdict: Verdict | null;
  /**
   * Per move, the verified "shortest passing duration" fix (quick-fixes.ts), index-aligned with `moves`;
   * `null` or absent while the full check runs: no shortest-duration button is offered unverified.
   */
  fixes?: readonly (QuickFix | null)[] | null;
}

/** A move's goal in a few characters: the joints that change, in display units. */
function goalSummary(
  joints: readonly Joint[],
  goal: readonly number[],
  before: readonly number[],
  unit: AngleUnit,
): string {
  const parts: string[] = [];
  joints.forEach((joint, j) => {
    if (Math.abs(goal[j] - before[j]) < 1e-12) return;
    const v = toDisplay(goal[j], joint.type, unit);
    parts.push(
      `${joint.name} ${v.toFixed(joint.type === "prismatic" || unit === "deg" ? 0 : 2)}${unitLabel(joint.type, unit) === "°" ? "°" : ""}`,
    );
  });
  return parts.length === 0
    ? "holds pose"
    : parts.length > 2
      ? `${parts.slice(0, 2).join(", ")} +${parts.length - 2}`
      : parts.join(", ");
}

/**
 * The plan outline as a table: the start pose, then one row per move with its goal, duration, shape,
 * verdict and actions. Rows are reordered with the up/down buttons or Alt+↑ / Alt+↓ on a focused row;
 * the change is announced to screen readers.
 */
export function MoveList({
  joints,
  startPose,
  moves,
  reports,
  unit,
  selected,
  onSelect,
  dispatch,
  startVerdict,
  fixes,
}: MoveListProps) {
  const [announcement, setAnnouncement] = useState("");
  const rows = useRef<(HTMLTableRowElement | null)[]>([]);

  const reorder = (index: number, by: -1 | 1) => {
    const to = index + by;
    if (to < 0 || to >= moves.length) return;
    dispatch({ type: "move-move", index, by });
    if (selected === index) onSelect(to);
    setAnnouncement(`${moveLabel(index)} is now move ${moveNumber(to)} of ${moves.length}.`);
    // keep keyboard focus on the row that moved
    requestAnimationFrame(() => rows.current[to]?.focus());
  };

  const onRowKey = (e: KeyboardEvent<HTMLTableRowElement>, index: number) => {
    if (e.target !== e.currentTarget) return;
    if (e.altKey && (e.key === "ArrowUp" || e.key === "ArrowDown")) {
      e.preventDefault();
      reorder(index, e.key === "ArrowUp" ? -1 : 1);
    } else if (e.key === "Enter" || e.key === " ") {
      e.preventDefault();
      onSelect(index);
    } else if (e.key === "ArrowUp" || e.key === "ArrowDown") {
      e.preventDefault();
      rows.current[index + (e.key === "ArrowUp" ? -1 : 1)]?.focus();
    } else if (e.key === "Delete") {
      e.preventDefault();
      dispatch({ type: "delete-move", index });
      setAnnouncement(`${moveLabel(index)} deleted.`);
    }
  };

  // The rows are memoised: they get callbacks that never change and reach the latest handlers, so an
  // edit redraws only the rows whose move, verdict or selection changed (a 30-move plan redrew all).
  const latest = useRef({ onSelect, onRowKey });
  useLayoutEffect(() => {
    latest.current = { onSelect, onRowKey };
  });
  const selectRow = useCallback((i: number) => latest.current.onSelect(i), []);
  const keyOnRow = useCallback((e: KeyboardEvent<HTMLTableRowElement>, i: number) => latest.current.onRowKey(e, i), []);
  const registerRow = useCallback((i: number, el: HTMLTableRowElement | null) => {
    rows.current[i] = el;
  }, []);

  return (
    <div className="flex flex-col gap-2">
      <Table aria-label="Moves" aria-describedby="move-list-help">
        <thead>
          <tr>
            <Th>Move · goal</Th>
            <Th numeric className="w-[5.5rem]">
              Duration s
            </Th>
            <Th className="w-[5.75rem]">Shape</Th>
            <Th className="w-[4.75rem]">Verdict</Th>
          </tr>
        </thead>
        <tbody>
          <tr
            aria-selected={selected === "start"}
            onClick={() => onSelect("start")}
            className={cn("cursor-pointer", selected === "start" ? "bg-brand-50" : "hover:bg-paper")}
          >
            <Td colSpan={3}>
              <button type="button" className="text-left font-medium hover:underline" onClick={() => onSelect("start")}>
                Start pose
              </button>
            </Td>
            <Td>{startVerdict ? <VerdictChip verdict={startVerdict} size="sm" /> : null}</Td>
          </tr>
          {moves.map((move, i) => {
            const report = reports[i];
            const verdict = report ? verdictOf(report.findings) : "pass";
            const before = i === 0 ? null : moves[i - 1].goal;
            const fix = fixes?.[i] ?? null;
            const safe = fix && fix.action.type === "set-duration" ? fix.action.duration : null;
            const noDuration = report !== undefined && report.minSafeDuration === null && verdict === "fault";
            const isSelected = selected === i;
            return (
              <FragmentRows key={i}>
                <MoveRow
                  index={i}
                  move={move}
                  before={before ?? startPose}
                  joints={joints}
                  unit={unit}
                  verdict={verdict}
                  selected={isSelected}
                  dispatch={dispatch}
                  onSelect={selectRow}
                  onKey={keyOnRow}
                  register={registerRow}
                />
                {isSelected ? (
                  <tr className="bg-brand-50">
                    <td colSpan={4} className="border-b border-line px-2 pb-2">
                      <div className="flex flex-wrap items-center gap-1">
                        {fix && safe !== null ? (
                          <Button
                            size="sm"
                            variant={verdict === "fault" ? "primary" : "secondary"}
                            aria-label={`Set move ${moveNumber(i)} to its shortest safe duration, ${safe.toFixed(3)} s`}
                            onClick={() => dispatch(fix.action)}
                          >
                            Shortest safe: <span className="tabular font-mono">{safe.toFixed(3)} s</span>
                          </Button>
                        ) : noDuration ? (
                          <span className="text-[11px] text-fault" data-testid={`no-duration-${i}`}>
                            No duration of this move passes every check.
                          </span>
                        ) : null}
                        <span className="flex-1" />
                        <Button
                          size="sm"
                          variant="ghost"
                          aria-label={`${moveLabel(i)} up`}
                          disabled={i === 0}
                          onClick={() => reorder(i, -1)}
                        >
                          <UpIcon size={13} />
                        </Button>
                        <Button
                          size="sm"
                          variant="ghost"
                          aria-label={`${moveLabel(i)} down`}
                          disabled={i === moves.length - 1}
                          onClick={() => reorder(i, 1)}
                        >
                          <DownIcon size={13} />
                        </Button>
                        <Button
                          size="sm"
                          variant="ghost"
                          aria-label={`Duplicate move ${moveNumber(i)}`}
                          onClick={() => {
                            dispatch({ type: "duplicate-move", index: i });
                            setAnnouncement(`${moveLabel(i)} duplicated as move ${moveNumber(i + 1)}.`);
                          }}
                        >
                          <CopyIcon size={13} />
                        </Button>
                        <Button
                          size="sm"
                          variant="ghost"
                          aria-label={`Delete move ${moveNumber(i)}`}
                          onClick={() => {
                            dispatch({ type: "delete-move", index: i });
                            onSelect(i > 0 ? i - 1 : "start");
                            setAnnouncement(`${moveLabel(i)} deleted.`);
                          }}
                        >
                          <TrashIcon size={13} />
                        </Button>
                      </div>
                      <MoveFiguresLine index={i} report={report} joints={joints} />
                    </td>
                  </tr>
                ) : null}
              </FragmentRows>
            );
          })}
        </tbody>
      </Table>
      {moves.length === 0 ? (
        <p className="px-2 text-xs text-ink-soft">
          No moves yet: the arm holds its start pose. Add a move to plan motion.
        </p>
      ) : null}
      <div className="flex items-center gap-2">
        <Button
          size="sm"
          onClick={() => {
            dispatch({ type: "add-move" });
            onSelect(moves.length);
            setAnnouncement(`${moveLabel(moves.length)} added.`);
          }}
        >
          <PlusIcon size={13} /> Add move
        </Button>
        <p id="move-list-help" className="text-[11px] text-ink-faint">
          Alt+↑/↓ on a row reorders it; Delete removes it.
        </p>
      </div>
      <p aria-live="polite" className="sr-only">
        {announcement}
      </p>
    </div>
  );
}

/** One move's row of the outline (memoised: see MoveList). */
const MoveRow = memo(function MoveRow({
  index: i,
  move,
  before,
  joints,
  unit,
  verdict,
  selected,
  dispatch,
  onSelect,
  onKey,
  register,
}: {
  index: number;
  move: Move;
  /** The pose the move starts from: the previous goal, or the start pose. */
  before: readonly number[];
  joints: readonly Joint[];
  unit: AngleUnit;
  verdict: Verdict;
  selected: boolean;
  dispatch: (action: PlanAction) => void;
  onSelect: (index: number) => void;
  onKey: (e: KeyboardEvent<HTMLTableRowElement>, index: number) => void;
  register: (index: number, el: HTMLTableRowElement | null) => void;
}) {
  const summary = goalSummary(joints, move.goal, before, unit);
  return (
    <tr
      ref={(el) => register(i, el)}
      tabIndex={0}
      aria-selected={selected}
      aria-label={`${moveLabel(i)}: ${verdict}`}
      data-testid={`move-row-${i}`}
      onClick={() => onSelect(i)}
      onKeyDown={(e) => onKey(e, i)}
      className={cn(
        "cursor-pointer focus:outline-2 focus:-outline-offset-2 focus:outline-brand-500",
        selected ? "bg-brand-50" : "hover:bg-paper",
      )}
    >
      <Td className="max-w-0">
        <span className="block text-xs font-semibold">{moveLabel(i, move.duration === 0)}</span>
        <span className="block truncate text-[11px] text-ink-soft" title={summary}>
          {summary}
        </span>
      </Td>
      <Td numeric onClick={(e) => e.stopPropagation()}>
        <NumberInput
          value={move.duration}
          digits={3}
          aria-label={`${moveLabel(i)} duration (s)`}
          onValue={(d) => d >= 0 && dispatch({ type: "set-duration", index: i, duration: d })}
          className="h-7 w-[4.75rem]"
        />
      </Td>
      <Td onClick={(e) => e.stopPropagation()}>
        <select
          aria-label={`${moveLabel(i)} shape`}
          value={move.shape}
          onChange={(e) => dispatch({ type: "set-shape", index: i, shape: e.target.value as ShapeName })}
          className="h-7 w-full rounded border border-line bg-panel px-1 text-xs"
        >
          {shapeNames.map((s) => (
            <option key={s} value={s}>
              {s}
            </option>
          ))}
        </select>
      </Td>
      <Td>
        <VerdictChip verdict={verdict} size="sm" />
      </Td>
    </tr>
  );
});

/** Peak effort and tool speed of the selected move, from the arm model (nothing without a chain). */
function MoveFiguresLine({
  index,
  report,
  joints,
}: {
  index: number;
  report: MoveReport | undefined;
  joints: readonly Joint[];
}) {
  const { toolSpeed, effort } = moveFigures(report, joints);
  if (!toolSpeed && !effort) return null;
  return (
    <dl
      className="tabular mt-1 flex flex-wrap gap-x-3 px-0.5 font-mono text-[11px] text-ink-soft"
      aria-label={`${moveLabel(index)} peaks`}
      data-testid={`move-figures-${index}`}
    >
      {effort ? (
        <div className="flex gap-1">
          <dt className="font-sans text-ink-faint">Peak effort</dt>
          <dd>{effort}</dd>
        </div>
      ) : null}
      {toolSpeed ? (
        <div className="flex gap-1">
          <dt className="font-sans text-ink-faint">Tool speed</dt>
          <dd>{toolSpeed}</dd>
        </div>
      ) : null}
    </dl>
  );
}

function FragmentRows({ children }: { children: React.ReactNode }) {
  return <>{children}</>;
}
