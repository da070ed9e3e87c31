"use client";
import Link from "next/link";
import { useMemo, useState } from "react";
import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getSortedRowModel,
  useReactTable,
  type CellContext,
  type SortingState,
} from "@tanstack/react-table";
import type { CellRow } from "@/lib/db/networks/data";

/** Per cell code, the parameters whose value differs from today's, with today's value. */
export type CellDifferences = Record<string, Partial<Record<string, number | string>>>;

const column = createColumnHelper<CellRow>();

export function CellsTable({ cells, differences }: { cells: CellRow[]; differences?: CellDifferences }) {
  const [sorting, setSorting] = useState<SortingState>([{ id: "code", desc: false }]);
  const [filter, setFilter] = useState("");
  const columns = useMemo(() => {
    // a parameter that differs from today is highlighted, with today's value beside it
    const parameter = (digits: number | null) => (info: CellContext<CellRow, unknown>) => {
      const value = info.getValue() as number | string;
      const text = digits === null ? String(value) : Number(value).toFixed(digits);
      const today = differences?.[info.row.original.code]?.[info.column.id];
      if (today === undefined) return text;
      const todayText = digits === null ? String(today) : Number(today).toFixed(digits);
      return (
        <span className="cell-differs" title={`today ${todayText}`}>
          {text} <span className="cell-differs-now">now {todayText}</span>
        </span>
      );
    };
    const fixed = (digits: number) => (info: CellContext<CellRow, unknown>) => Number(info.getValue()).toFixed(digits);
    return [
      column.accessor("code", {
        header: "Cell",
        cell: (info) => <Link href={`/network/cells/${encodeURIComponent(info.getValue())}`}>{info.getValue()}</Link>,
      }),
      column.accessor("siteName", { header: "Site" }),
      column.accessor("azimuthDeg", { header: "Azimuth °", cell: parameter(1), meta: { numeric: true } }),
      column.accessor("mechanicalTiltDeg", { header: "M-tilt °", cell: parameter(1), meta: { numeric: true } }),
      column.accessor("electricalTiltDeg", { header: "E-tilt °", cell: parameter(1), meta: { numeric: true } }),
      column.accessor("beamSetId", { header: "Beam set", cell: parameter(null) }),
      column.accessor("rsPowerDbm", { header: "RS power dBm", cell: parameter(1), meta: { numeric: true } }),
      column.accessor("antennaHeightM", { header: "Height m", cell: fixed(1), meta: { numeric: true } }),
      column.accessor("frequencyMHz", { header: "MHz", meta: { numeric: true } }),
      column.accessor("bandwidthMHz", { header: "BW MHz", meta: { numeric: true } }),
      column.accessor("antennaModel", { header: "Antenna" }),
    ];
  }, [differences]);
  const table = useReactTable({
    data: cells,
    columns,
    state: { sorting, globalFilter: filter },
    onSortingChange: setSorting,
    onGlobalFilterChange: setFilter,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
  });
  return (
    <>
      <div className="tools">
        <input placeholder="Filter cells…" value={filter} onChange={(e) => setFilter(e.target.value)} aria-label="Filter cells" />
        <span className="muted">{table.getRowModel().rows.length} of {cells.length} cells</span>
      </div>
      <div style={{ overflowX: "auto" }}>
        <table className="data" data-testid="cells-table">
          <thead>
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => {
                  const numeric = (header.column.columnDef.meta as { numeric?: boolean } | undefined)?.numeric;
                  const sorted = header.column.getIsSorted();
                  return (
                    <th key={header.id} className={numeric ? "num" : undefined} aria-sort={sorted ? (sorted === "asc" ? "ascending" : "descending") : "none"}>
                      <button onClick={header.column.getToggleSortingHandler()}>
                        {flexRender(header.column.columnDef.header, header.getContext())}
                        {sorted === "asc" ? " ▲" : sorted === "desc" ? " ▼" : ""}
                      </button>
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className={differences?.[row.original.code] ? "row-differs" : undefined}>
                {row.getVisibleCells().map((cell) => {
                  const numeric = (cell.column.columnDef.meta as { numeric?: boolean } | undefined)?.numeric;
                  return (
                    <td key={cell.id} className={numeric ? "num" : undefined}>
                      {flexRender(cell.column.columnDef.cell, cell.getContext())}
                    </td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </>
  );
}
