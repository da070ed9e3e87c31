"use client";
// The change-request list: filters, free-text search, sorting, column choice, paging, and a CSV of exactly
// what is on screen (all filtered rows in the current order, the visible columns).
import { useMemo, useState } from "react";
import Link from "next/link";
import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  getPaginationRowModel,
  getSortedRowModel,
  useReactTable,
  type SortingState,
  type VisibilityState,
} from "@tanstack/react-table";
import { REQUEST_STATES, STATE_LABELS, type RequestState } from "@/lib/changes/rules";
import { downloadText, toCsv, type CsvValue } from "./csv";
import { utcDate, utcDateTime } from "./format";
import { Pager } from "./Pager";
import { SortableHead, isNumeric } from "./SortableHead";
import type { RequestRowDto } from "./types";

/** Badge tone per state: settled-good, settled-bad, needs attention, in progress. */
export const STATE_TONES: Record<RequestState, "" | "good" | "bad" | "warn" | "info"> = {
  draft: "",
  submitted: "info",
  simulated: "info",
  approved: "good",
  rejected: "bad",
  returned: "warn",
  implemented: "good",
  rolled_back: "warn",
};

export function StateBadge({ state }: { state: RequestState }) {
  const tone = STATE_TONES[state];
  return <span className={tone ? `badge ${tone}` : "badge"} data-state={state}>{STATE_LABELS[state]}</span>;
}

function FlagBadges({ row }: { row: RequestRowDto }) {
  return (
    <>
      {row.stale && (
        <span className="badge warn" title="Another request on the same cells went ahead; rebase and simulate again before approval">
          Needs rebase
        </span>
      )}
      {row.conflictWith.length > 0 && (
        <span className="badge bad" title="Open requests that change the same cells">
          Overlaps {row.conflictWith.map((n) => `#${n}`).join(", ")}
        </span>
      )}
    </>
  );
}

interface ColumnMeta {
  numeric?: boolean;
  /** Header and value in the CSV file. */
  csvHeader: string;
  csv: (row: RequestRowDto) => CsvValue;
}

const column = createColumnHelper<RequestRowDto>();

const COLUMN_LABELS: Record<string, string> = {
  number: "Number",
  title: "Title",
  state: "State",
  authorName: "Author",
  clusters: "Clusters",
  cellCount: "Cells",
  updatedAt: "Updated",
  createdAt: "Created",
};

export interface RequestsTableProps {
  rows: RequestRowDto[];
  /** Columns hidden at first (default: createdAt). */
  initiallyHidden?: string[];
  pageSize?: number;
}

/** Midnight UTC at the start of a "YYYY-MM-DD" day, ms; NaN when empty or invalid. */
const dayStartUtc = (day: string) => (day ? Date.parse(`${day}T00:00:00Z`) : NaN);
const DAY_MS = 86_400_000;

export function RequestsTable({ rows, initiallyHidden = ["createdAt"], pageSize = 20 }: RequestsTableProps) {
  const [sorting, setSorting] = useState<SortingState>([{ id: "updatedAt", desc: true }]);
  const [visibility, setVisibility] = useState<VisibilityState>(() => Object.fromEntries(initiallyHidden.map((id) => [id, false])));
  const [search, setSearch] = useState("");
  const [stateFilter, setStateFilter] = useState<RequestState | "">("");
  const [authorFilter, setAuthorFilter] = useState("");
  const [clusterFilter, setClusterFilter] = useState("");
  const [updatedFrom, setUpdatedFrom] = useState("");
  const [updatedTo, setUpdatedTo] = useState("");

  const authors = useMemo(() => [...new Set(rows.map((r) => r.authorName))].sort((a, b) => a.localeCompare(b)), [rows]);
  const clusters = useMemo(() => [...new Set(rows.flatMap((r) => r.clusters))].sort((a, b) => a.localeCompare(b)), [rows]);

  const filtered = useMemo(() => {
    const needle = search.trim().toLowerCase();
    const from = dayStartUtc(updatedFrom);
    // "to" includes the whole day
    const to = dayStartUtc(updatedTo) + DAY_MS;
    return rows.filter((r) => {
      if (stateFilter && r.state !== stateFilter) return false;
      if (authorFilter && r.authorName !== authorFilter) return false;
      if (clusterFilter && !r.clusters.includes(clusterFilter)) return false;
      const updated = Date.parse(r.updatedAt);
      if (!Number.isNaN(from) && !(updated >= from)) return false;
      if (!Number.isNaN(to) && !(updated < to)) return false;
      if (needle) {
        const haystack = [`#${r.number}`, r.title, r.authorName, STATE_LABELS[r.state], ...r.clusters].join("\n").toLowerCase();
        if (!haystack.includes(needle)) return false;
      }
      return true;
    });
  }, [rows, search, stateFilter, authorFilter, clusterFilter, updatedFrom, updatedTo]);

  const columns = useMemo(
    () => [
      column.accessor("number", {
        header: "#",
        sortingFn: "basic",
        meta: { numeric: true, csvHeader: "Number", csv: (r) => r.number } satisfies ColumnMeta,
        cell: (info) => <Link href={`/requests/${encodeURIComponent(info.row.original.id)}`}>#{info.getValue()}</Link>,
      }),
      column.accessor("title", {
        header: "Title",
        sortingFn: "text",
        meta: { csvHeader: "Title", csv: (r) => r.title } satisfies ColumnMeta,
        cell: (info) => <Link href={`/requests/${encodeURIComponent(info.row.original.id)}`}>{info.getValue()}</Link>,
      }),
      column.accessor((r) => REQUEST_STATES.indexOf(r.state), {
        id: "state",
        header: "State",
        sortingFn: "basic",
        meta: {
          csvHeader: "State",
          csv: (r) => [STATE_LABELS[r.state], r.stale ? "needs rebase" : "", r.conflictWith.length ? `overlaps ${r.conflictWith.map((n) => `#${n}`).join(" ")}` : ""].filter(Boolean).join("; "),
        } satisfies ColumnMeta,
        cell: (info) => (
          <span className="badges">
            <StateBadge state={info.row.original.state} />
            <FlagBadges row={info.row.original} />
          </span>
        ),
      }),
      column.accessor("authorName", { header: "Author", sortingFn: "text", meta: { csvHeader: "Author", csv: (r) => r.authorName } satisfies ColumnMeta }),
      column.accessor((r) => r.clusters.join(", "), {
        id: "clusters",
        header: "Clusters",
        sortingFn: "text",
        meta: { csvHeader: "Clusters", csv: (r) => r.clusters.join("; ") } satisfies ColumnMeta,
      }),
      column.accessor("cellCount", { header: "Cells", sortingFn: "basic", meta: { numeric: true, csvHeader: "Cells", csv: (r) => r.cellCount } satisfies ColumnMeta }),
      column.accessor((r) => Date.parse(r.updatedAt), {
        id: "updatedAt",
        header: "Updated (UTC)",
        sortingFn: "basic",
        meta: { csvHeader: "Updated", csv: (r) => r.updatedAt } satisfies ColumnMeta,
        cell: (info) => <time dateTime={info.row.original.updatedAt}>{utcDateTime(info.row.original.updatedAt)}</time>,
      }),
      column.accessor((r) => Date.parse(r.createdAt), {
        id: "createdAt",
        header: "Created (UTC)",
        sortingFn: "basic",
        meta: { csvHeader: "Created", csv: (r) => r.createdAt } satisfies ColumnMeta,
        cell: (info) => <time dateTime={info.row.original.createdAt}>{utcDateTime(info.row.original.createdAt)}</time>,
      }),
    ],
    [],
  );

  const table = useReactTable({
    data: filtered,
    columns,
    state: { sorting, columnVisibility: visibility },
    onSortingChange: setSorting,
    onColumnVisibilityChange: setVisibility,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getPaginationRowModel: getPaginationRowModel(),
    initialState: { pagination: { pageIndex: 0, pageSize } },
  });

  const downloadCsv = () => {
    const visible = table.getVisibleLeafColumns();
    const metas = visible.map((c) => c.columnDef.meta as ColumnMeta);
    // the sorted model holds every filtered row in screen order, before paging
    const body = table.getSortedRowModel().rows.map((row) => metas.map((m) => m.csv(row.original)));
    downloadText(`change-requests-${utcDate(Date.now())}.csv`, toCsv(metas.map((m) => m.csvHeader), body));
  };

  const filtersActive = Boolean(search || stateFilter || authorFilter || clusterFilter || updatedFrom || updatedTo);
  const clearFilters = () => {
    setSearch("");
    setStateFilter("");
    setAuthorFilter("");
    setClusterFilter("");
    setUpdatedFrom("");
    setUpdatedTo("");
  };

  return (
    <div className="requests-table">
      <div className="tools">
        <input type="search" placeholder="Search number, title, author, cluster…" value={search} onChange={(e) => setSearch(e.target.value)} aria-label="Search requests" />
        <select aria-label="State" value={stateFilter} onChange={(e) => setStateFilter(e.target.value as RequestState | "")}>
          <option value="">Any state</option>
          {REQUEST_STATES.map((s) => (
            <option key={s} value={s}>{STATE_LABELS[s]}</option>
          ))}
        </select>
        <select aria-label="Author" value={authorFilter} onChange={(e) => setAuthorFilter(e.target.value)}>
          <option value="">Any author</option>
          {authors.map((a) => (
            <option key={a} value={a}>{a}</option>
          ))}
        </select>
        <select aria-label="Cluster" value={clusterFilter} onChange={(e) => setClusterFilter(e.target.value)}>
          <option value="">Any cluster</option>
          {clusters.map((c) => (
            <option key={c} value={c}>{c}</option>
          ))}
        </select>
        <span className="inline-field">
          <span className="muted">Updated from</span>
          <input type="date" aria-label="Updated from (UTC)" value={updatedFrom} max={updatedTo || undefined} onChange={(e) => setUpdatedFrom(e.target.value)} />
          <span className="muted">to</span>
          <input type="date" aria-label="Updated to (UTC)" value={updatedTo} min={updatedFrom || undefined} onChange={(e) => setUpdatedTo(e.target.value)} />
        </span>
        {filtersActive && (
          <button type="button" className="secondary" onClick={clearFilters}>Clear filters</button>
        )}
      </div>
      <div className="tools">
        <span className="muted" data-testid="requests-count">
          {filtered.length} of {rows.length} requests
        </span>
        <details className="menu">
          <summary>Columns</summary>
          <div className="menu-body" role="group" aria-label="Visible columns">
            {table.getAllLeafColumns().map((c) => (
              <label key={c.id} className="menu-check">
                <input type="checkbox" checked={c.getIsVisible()} onChange={c.getToggleVisibilityHandler()} disabled={c.getIsVisible() && table.getVisibleLeafColumns().length === 1} />
                {COLUMN_LABELS[c.id] ?? c.id}
              </label>
            ))}
          </div>
        </details>
        <button type="button" className="secondary" onClick={downloadCsv} disabled={filtered.length === 0}>
          Download CSV
        </button>
      </div>
      <div style={{ overflowX: "auto" }}>
        <table className="data" data-testid="requests-table">
          <SortableHead table={table} />
          <tbody>
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} data-request={row.original.number}>
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className={isNumeric(cell.column.columnDef.meta) ? "num" : undefined}>
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
            {filtered.length === 0 && (
              <tr>
                <td colSpan={table.getVisibleLeafColumns().length || 1} className="muted">
                  {rows.length === 0 ? "No change requests yet." : "No request matches these filters."}
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>
      <Pager table={table} noun="requests" />
    </div>
  );
}
