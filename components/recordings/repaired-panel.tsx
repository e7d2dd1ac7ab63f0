"use client";
/** The repaired recording: its verdict, how far it departs from the original, saving it as a plan, exporting it. */
import { Button } from "@/components/ui/button";
import { SelectField, TextField } from "@/components/ui/field";
import { ErrorNote } from "@/components/ui/panel";
import { Table, Td, Th } from "@/components/ui/table";
import { VerdictChip, type VerdictName } from "@/components/ui/verdict-chip";
import { formatJointValue, type AngleUnit } from "@/lib/shared/units";
import type { RepairedRecording } from "./recording-session";
import type { RecordingSessionApi } from "./use-recording-session";

export function RepairedPanel({
  session,
  repaired,
  canEdit,
  unit,
}: {
  session: RecordingSessionApi;
  repaired: RepairedRecording;
  canEdit: boolean;
  unit: AngleUnit;
}) {
  const { state, dispatch, chosen, save, setSpacing } = session;
  const joints = chosen?.arm.joints ?? [];
  const { planPreview } = state;
  return (
    <section aria-label="Repaired recording" className="flex flex-col gap-2 border-t border-line pt-3">
      <div className="flex items-center gap-2">
        <h2 className="text-sm font-semibold">Repaired</h2>
        <VerdictChip verdict={repaired.report.verdict as VerdictName} />
      </div>
      <Table aria-label="Largest departure from the original, per joint">
        <thead>
          <tr>
            <Th>Joint</Th>
            <Th numeric>Largest departure</Th>
          </tr>
        </thead>
        <tbody>
          {joints.map((j, i) => (
            <tr key={j.name}>
              <Td className="text-xs">{j.name}</Td>
              <Td numeric>{formatJointValue(repaired.maxDeviation[i], j.type, unit)}</Td>
            </tr>
          ))}
        </tbody>
      </Table>
      <p className="text-[11px] text-ink-soft">
        The repaired path lags the original where the hand moved faster than the joint may; the table says by how much.
      </p>
      {canEdit && planPreview ? (
        <div className="flex flex-col gap-2 rounded-md border border-line p-2">
          <TextField
            label="Plan name"
            value={state.planName}
            onChange={(e) => dispatch({ type: "plan-name", name: e.target.value })}
            maxLength={120}
          />
          <SelectField
            label="Waypoint spacing"
            value={state.spacingS}
            onChange={(e) => setSpacing(Number(e.target.value))}
          >
            {[0.25, 0.5, 1, 2].map((s) => (
              <option key={s} value={s}>
                every {s} s
              </option>
            ))}
          </SelectField>
          <p className="flex flex-wrap items-center gap-1 text-[11px] text-ink-soft">
            {planPreview.plan.moves.length} moves; {planPreview.lengthened} lengthened to their shortest safe duration.
            Plan verdict:
            <VerdictChip verdict={planPreview.report.verdict} size="sm" />
          </p>
          <Button variant="primary" disabled={!state.planName.trim() || save.isPending} onClick={() => save.mutate()}>
            {save.isPending ? "Saving…" : "Save as plan"}
          </Button>
          {save.error ? <ErrorNote title="The plan was not saved">{save.error.message}</ErrorNote> : null}
        </div>
      ) : null}
      <Button onClick={() => dispatch({ type: "exporting", open: true })}>Export repaired CSV</Button>
    </section>
  );
}
