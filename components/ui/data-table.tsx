"use client";

/**
 * The one data table: TanStack Table (v9) for sorting and filtering, our own markup and styles
 * (components/ui/table.tsx), and TanStack Virtual for rows once a list is long enough that
 * drawing every row would slow the page. Sorting is by a click on a column header; filtering is
 * one search text over every text column, owned by the caller so it can sit in a page header.
 */
import {
  columnFilteringFeature,
  createColumnHelper,
  createFilteredRowModel,
  createSortedRowModel,
  filterFn_includesString,
  globalFilteringFeature,
  metaHelper,
  rowSortingFeature,
  sortFn_alphanumeric,
  sortFn_basic,
  sortFn_datetime,
  sortFn_text,
  tableFeatures,
  useTable,
  type ColumnDef,
  type ColumnHelper,
  type SortingState,
} from "@tanstack/react-table";
import { useVirtualizer } from "@tanstack/react-virtual";
import { useRef, useState, type ReactNode } from "react";
import { cn } from "./cn";
import { Table, Td, Th } from "./table";

/** Per-column presentation: numbers right-aligned in tabular monospace. */
export type DataColumnMeta = { numeric?: boolean; headerClassName?: string; cellClassName?: string };

export const dataTableFeatures = tableFeatures({
  columnMeta: metaHelper<DataColumnMeta>(),
  rowSortingFeature,
  columnFilteringFeature,
  globalFilteringFeature,
  filteredRowModel: createFilteredRowModel(),
  sortedRowModel: createSortedRowModel(),
  sortFns: { alphanumeric: sortFn_alphanumeric, basic: sortFn_basic, datetime: sortFn_datetime, text: sortFn_text },
  filterFns: { includesString: filterFn_includesString },
});

export type DataTableFeatures = typeof dataTableFeatures;

/** The columns of a table of `T`, as `columnsFor<T>().columns([...])` returns them. */
export type DataColumns<T extends object> = ReturnType<ColumnHelper<DataTableFeatures, T>["columns"]>;

/** A typed column helper for one row type. */
export function columnsFor<T extends object>() {
  return createColumnHelper<DataTableFeatures, T>();
}

/** Rows above this count are virtualised: only those in view (and a few around) are drawn. */
export const VIRTUALIZE_ABOVE = 200;
const ROW_HEIGHT_PX = 34;

export interface DataTableProps<T extends object> {
  data: T[];
  columns: DataColumns<T>;
  /** The table's accessible name. */
  label: string;
  getRowId: (row: T) => string;
  /** Text to filter rows by (over every text and number column); empty shows all. */
  filter?: string;
  initialSorting?: SortingState;
  /** Told of every sorting change (after the table has taken it), e.g. to keep it in the URL. */
  onSortingChange?: (sorting: SortingState) => void;
  /** What to show when there are no rows at all. */
  empty?: ReactNode;
  /** What to show when the filter leaves no rows. */
  noMatch?: ReactNode;
  /** Height of the scrolling box when the rows are virtualised. */
  maxHeightPx?: number;
  className?: string;
  rowClassName?: string;
  testId?: string;
  /** `data-testid` on every body row, for browser tests that pick a row by its text. */
  rowTestId?: string;
}

export function DataTable<T extends object>({
  data,
  columns,
  label,
  getRowId,
  filter = "",
  initialSorting = [],
  onSortingChange,
  empty,
  noMatch,
  maxHeightPx = 560,
  className,
  rowClassName,
  testId,
  rowTestId,
}: DataTableProps<T>) {
  const [sorting, setSorting] = useState<SortingState>(initialSorting);
  const table = useTable({
    features: dataTableFeatures,
    columns: columns as ColumnDef<DataTableFeatures, T>[],
    data,
    getRowId: (row) => getRowId(row),
    state: { sorting, globalFilter: filter },
    onSortingChange: (updater) => {
      const next = typeof updater === "function" ? updater(sorting) : updater;
      setSorting(next);
      onSortingChange?.(next);
    },
    globalFilterFn: "includesString",
    enableSortingRemoval: false,
  });
  const rows = table.getRowModel().rows;
  const virtual = rows.length > VIRTUALIZE_ABOVE;
  const scrollRef = useRef<HTMLDivElement>(null);
  // TanStack Virtual returns fresh functions each render by design; the compiler skipping this component is expected.
  // eslint-disable-next-line react-hooks/incompatible-library
  const virtualizer = useVirtualizer({
    count: rows.length,
    getScrollElement: () => scrollRef.current,
    estimateSize: () => ROW_HEIGHT_PX,
    overscan: 12,
    enabled: virtual,
    // The server and the first client render have no box to measure: draw the first screenful.
    initialRect: { width: 1200, height: maxHeightPx },
  });
  const columnCount = table.getAllLeafColumns().length;

  if (data.length === 0 && empty) return <>{empty}</>;

  const items = virtual ? virtualizer.getVirtualItems() : null;
  const shown = items ? items.map((item) => rows[item.index]) : rows;
  const padTop = items && items.length > 0 ? items[0].start : 0;
  const padBottom = items && items.length > 0 ? virtualizer.getTotalSize() - items[items.length - 1].end : 0;

  return (
    <div
      ref={scrollRef}
      className={cn(virtual && "relative overflow-y-auto", className)}
      style={virtual ? { maxHeight: maxHeightPx } : undefined}
      data-testid={testId}
      data-virtual={virtual ? "true" : undefined}
    >
      <Table aria-label={label} aria-rowcount={rows.length + 1}>
        <thead className={cn(virtual && "sticky top-0 z-10 bg-panel")}>
          {table.getHeaderGroups().map((group) => (
            <tr key={group.id}>
              {group.headers.map((header) => {
                const meta = header.column.columnDef.meta;
                const sorted = header.column.getIsSorted();
                const canSort = header.column.getCanSort();
                return (
                  <Th
                    key={header.id}
                    numeric={meta?.numeric}
                    className={meta?.headerClassName}
                    aria-sort={
                      sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : canSort ? "none" : undefined
                    }
                  >
                    {header.isPlaceholder ? null : canSort ? (
                      <button
                        type="button"
                        onClick={header.column.getToggleSortingHandler()}
                        className={cn("inline-flex items-center gap-1 uppercase hover:text-ink", sorted && "text-ink")}
                      >
                        <table.FlexRender header={header} />
                        <span aria-hidden className="font-mono text-[10px]">
                          {sorted === "asc" ? "▲" : sorted === "desc" ? "▼" : "↕"}
                        </span>
                      </button>
                    ) : (
                      <table.FlexRender header={header} />
                    )}
                  </Th>
                );
              })}
            </tr>
          ))}
        </thead>
        <tbody>
          {padTop > 0 ? <tr aria-hidden style={{ height: padTop }} /> : null}
          {shown.map((row, i) => (
            <tr
              key={row.id}
              className={cn("hover:bg-paper", rowClassName)}
              data-testid={rowTestId}
              aria-rowindex={(items ? items[i].index : i) + 2}
            >
              {row.getAllCells().map((cell) => {
                const meta = cell.column.columnDef.meta;
                return (
                  <Td key={cell.id} numeric={meta?.numeric} className={meta?.cellClassName}>
                    <table.FlexRender cell={cell} />
                  </Td>
                );
              })}
            </tr>
          ))}
          {padBottom > 0 ? <tr aria-hidden style={{ height: padBottom }} /> : null}
          {rows.length === 0 ? (
            <tr>
              <Td colSpan={columnCount} className="py-4 text-ink-soft">
                {noMatch ?? "Nothing matches the filter."}
              </Td>
            </tr>
          ) : null}
        </tbody>
      </Table>
    </div>
  );
}
