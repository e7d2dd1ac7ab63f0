"use client";
import Link from "next/link";
import { useMemo, useState } from "react";
import { columnsFor, DataTable } from "@/components/ui/data-table";
import { DateTime } from "@/components/ui/date-time";
import { TextField } from "@/components/ui/field";
import { EmptyState } from "@/components/ui/panel";
import { VerdictChip } from "@/components/ui/verdict-chip";
import { submissionStatusWords, type SubmissionStatus } from "./status-words";

export interface MySubmissionRow {
  id: string;
  assignmentTitle: string;
  courseTitle: string;
  submittedAt: string;
  attempt: number;
  verdict: "pass" | "caution" | "fault";
  status: SubmissionStatus;
  late: boolean;
}

const col = columnsFor<MySubmissionRow>();

/** The caller's own submissions, newest first, sortable by each column and filtered by one search text. */
export function MySubmissions({ rows }: { rows: MySubmissionRow[] }) {
  const [filter, setFilter] = useState("");
  const columns = useMemo(
    () =>
      col.columns([
        col.accessor("assignmentTitle", {
          header: "Assignment",
          sortFn: "text",
          cell: (c) => (
            <>
              <Link href={`/reviews/${c.row.original.id}`} className="font-medium text-brand-700 hover:underline">
                {c.getValue()}
              </Link>
              <p className="text-xs text-ink-faint">
                {c.row.original.courseTitle} · attempt {c.row.original.attempt}
              </p>
            </>
          ),
        }),
        col.accessor("submittedAt", {
          header: "Submitted",
          sortFn: "basic",
          enableGlobalFilter: false,
          meta: { cellClassName: "tabular text-xs" },
          cell: (c) => (
            <>
              <DateTime value={c.getValue()} />
              {c.row.original.late ? " · late" : ""}
            </>
          ),
        }),
        col.accessor("verdict", {
          header: "Verdict",
          sortFn: "text",
          cell: (c) => <VerdictChip size="sm" verdict={c.getValue()} />,
        }),
        col.accessor((r) => submissionStatusWords[r.status], {
          id: "status",
          header: "Status",
          sortFn: "text",
          meta: { cellClassName: "text-xs" },
        }),
      ]),
    [],
  );
  if (rows.length === 0) {
    return (
      <div className="p-4">
        <EmptyState title="No submissions yet">
          Submit a saved plan version from a course&apos;s assignment list.
        </EmptyState>
      </div>
    );
  }
  return (
    <div className="p-3">
      <TextField
        label="Filter your submissions"
        type="search"
        placeholder="Assignment, verdict or status"
        fieldClassName="mb-2 w-64"
        value={filter}
        onChange={(e) => setFilter(e.target.value)}
      />
      <DataTable
        label="Your submissions"
        data={rows}
        columns={columns}
        getRowId={(r) => r.id}
        filter={filter}
        initialSorting={[{ id: "submittedAt", desc: true }]}
      />
    </div>
  );
}
