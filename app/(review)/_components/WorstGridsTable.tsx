"use client";
// The grids a change makes worse, most severe first (the engine's ranking is the "#" column); every column
// sorts, and choosing a row hands the grid to the page so the map can centre on it.
import { useMemo, useState } from "react";
import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  getPaginationRowModel,
  getSortedRowModel,
  useReactTable,
  type SortingState,
} from "@tanstack/react-table";
import { DASH, fixed, floorLabel } from "./format";
import { Pager } from "./Pager";
import { SortableHead, isNumeric } from "./SortableHead";
import type { WorstGridDto, WorstGridReasonDto } from "./types";

/** Our wording for why a grid is listed, and how loud the badge is. */
export const REASON_LABELS: Record<WorstGridReasonDto, { label: string; tone: "bad" | "warn"; hint: string }> = {
  "coverage-lost": { label: "Coverage lost", tone: "bad", hint: "Best RSRP fell under the coverage threshold" },
  "overlap-lost": { label: "Too many overlapping", tone: "warn", hint: "More cells now arrive within the overlap window than allowed" },
  "interference-lost": { label: "SINR under threshold", tone: "bad", hint: "Best server over interference plus noise fell under the threshold" },
  "rsrp-drop": { label: "Signal drop", tone: "warn", hint: "Best RSRP fell by more than the worst-grid drop setting" },
};

interface Row extends WorstGridDto {
  rank: number;
  clusterName: string | null;
  /** before − after best RSRP, dB; Infinity when the grid lost all signal. */
  dropDb: number | null;
}

const column = createColumnHelper<Row>();
const orUndefined = <T,>(v: T | null): T | undefined => (v === null ? undefined : v);
const dbCell = (unit: string) => (info: { getValue: () => number | undefined }) => {
  const v = info.getValue();
  return v === undefined ? <span className="muted">no signal</span> : fixed(v, 1, unit);
};

export interface WorstGridsTableProps {
  grids: WorstGridDto[];
  /** How many grids qualified before the engine's limit (shows "200 of 1,234"). */
  total?: number;
  /** Cluster id → display name; ids are shown where missing. */
  clusterNames?: Record<string, string>;
  /** gridIndex of the highlighted row. */
  selectedGridIndex?: number | null;
  onSelect?: (grid: WorstGridDto) => void;
  pageSize?: number;
}

export function WorstGridsTable({ grids, total, clusterNames = {}, selectedGridIndex = null, onSelect, pageSize = 20 }: WorstGridsTableProps) {
  const [sorting, setSorting] = useState<SortingState>([{ id: "rank", desc: false }]);
  const rows = useMemo<Row[]>(
    () =>
      grids.map((g, i) => ({
        ...g,
        rank: i + 1,
        clusterName: g.clusterId === null ? null : (clusterNames[g.clusterId] ?? g.clusterId),
        dropDb:
          g.bestRsrpBeforeDbm === null ? null : g.bestRsrpAfterDbm === null ? Infinity : g.bestRsrpBeforeDbm - g.bestRsrpAfterDbm,
      })),
    [grids, clusterNames],
  );
  const columns = useMemo(
    () => [
      column.accessor("rank", { header: "#", sortingFn: "basic", meta: { numeric: true } }),
      column.accessor("x", {
        id: "position",
        header: "Position x, y m",
        // west to east, then south to north
        sortingFn: (a, b) => a.original.x - b.original.x || a.original.y - b.original.y,
        cell: (info) => `${fixed(info.row.original.x, 0)}, ${fixed(info.row.original.y, 0)}`,
      }),
      column.accessor("floor", { header: "Floor", sortingFn: "basic", cell: (info) => floorLabel(info.getValue()) }),
      column.accessor((r) => orUndefined(r.clusterName), { id: "cluster", header: "Cluster", sortingFn: "text", sortUndefined: "last", cell: (info) => info.getValue() ?? DASH }),
      column.group({
        id: "serving",
        header: "Serving cell",
        columns: [
          column.accessor((r) => orUndefined(r.servingCellBefore), { id: "servingBefore", header: "Before", sortingFn: "alphanumeric", sortUndefined: "last", cell: (info) => info.getValue() ?? <span className="muted">none</span> }),
          column.accessor((r) => orUndefined(r.servingCellAfter), {
            id: "servingAfter",
            header: "After",
            sortingFn: "alphanumeric",
            sortUndefined: "last",
            cell: (info) => {
              const after = info.getValue();
              const changed = (after ?? null) !== info.row.original.servingCellBefore;
              return (
                <>
                  <span className="muted" aria-hidden>→ </span>
                  <span className={changed ? "cell-changed" : undefined}>{after ?? <span className="muted">none</span>}</span>
                </>
              );
            },
          }),
        ],
      }),
      column.group({
        id: "rsrp",
        header: "Best RSRP",
        columns: [
          column.accessor((r) => orUndefined(r.bestRsrpBeforeDbm), { id: "rsrpBefore", header: "Before", sortingFn: "basic", sortUndefined: "last", cell: dbCell("dBm"), meta: { numeric: true } }),
          column.accessor((r) => orUndefined(r.bestRsrpAfterDbm), { id: "rsrpAfter", header: "After", sortingFn: "basic", sortUndefined: "last", cell: dbCell("dBm"), meta: { numeric: true } }),
        ],
      }),
      column.group({
        id: "sinr",
        header: "SINR",
        columns: [
          column.accessor((r) => orUndefined(r.sinrBeforeDb), { id: "sinrBefore", header: "Before", sortingFn: "basic", sortUndefined: "last", cell: dbCell("dB"), meta: { numeric: true } }),
          column.accessor((r) => orUndefined(r.sinrAfterDb), { id: "sinrAfter", header: "After", sortingFn: "basic", sortUndefined: "last", cell: dbCell("dB"), meta: { numeric: true } }),
        ],
      }),
      column.accessor((r) => orUndefined(r.dropDb), {
        id: "drop",
        header: "Drop dB",
        sortingFn: "basic",
        sortUndefined: "last",
        meta: { numeric: true },
        cell: (info) => {
          const v = info.getValue();
          if (v === undefined) return DASH;
          if (v === Infinity) return <span className="worse">all lost</span>;
          return <span className={v > 0 ? "worse" : undefined}>{fixed(v, 1)}</span>;
        },
      }),
      // sorts by how many conditions the grid lost
      column.accessor((r) => r.reasons.length, {
        id: "reasons",
        header: "Why listed",
        sortingFn: "basic",
        cell: (info) => (
          <span className="badges">
            {info.row.original.reasons.map((reason) => (
              <span key={reason} className={`badge ${REASON_LABELS[reason].tone}`} title={REASON_LABELS[reason].hint}>
                {REASON_LABELS[reason].label}
              </span>
            ))}
          </span>
        ),
      }),
    ],
    [],
  );
  const table = useReactTable({
    data: rows,
    columns,
    state: { sorting },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getPaginationRowModel: getPaginationRowModel(),
    initialState: { pagination: { pageIndex: 0, pageSize } },
  });
  if (grids.length === 0) return <p className="muted">No grid gets worse with this change.</p>;
  return (
    <>
      {total !== undefined && total > grids.length && (
        <p className="muted">
          Showing the {grids.length.toLocaleString("en-US")} most affected of {total.toLocaleString("en-US")} grids that get worse.
        </p>
      )}
      <div style={{ overflowX: "auto" }}>
        <table className="data worst-grids" data-testid="worst-grids-table">
          <SortableHead table={table} />
          <tbody>
            {table.getRowModel().rows.map((row) => {
              const grid = row.original;
              const select = () => onSelect?.(grids[grid.rank - 1]);
              return (
                <tr
                  key={row.id}
                  className={[grid.gridIndex === selectedGridIndex ? "selected" : "", onSelect ? "clickable" : ""].join(" ").trim() || undefined}
                  onClick={onSelect ? select : undefined}
                  onKeyDown={onSelect ? (e) => (e.key === "Enter" || e.key === " ") && (e.preventDefault(), select()) : undefined}
                  tabIndex={onSelect ? 0 : undefined}
                >
                  {row.getVisibleCells().map((cell) => (
                    <td key={cell.id} className={isNumeric(cell.column.columnDef.meta) ? "num" : undefined}>
                      {flexRender(cell.column.columnDef.cell, cell.getContext())}
                    </td>
                  ))}
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      <Pager table={table} noun="grids" />
    </>
  );
}
