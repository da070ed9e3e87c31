"use client";
import { useMemo, useState } from "react";
import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getSortedRowModel,
  useReactTable,
  type SortingState,
} from "@tanstack/react-table";
import type { CellRow } from "@/lib/db/networks/data";

const column = createColumnHelper<CellRow>();
const fixed = (digits: number) => (info: { getValue: () => unknown }) => Number(info.getValue()).toFixed(digits);

export function CellsTable({ cells }: { cells: CellRow[] }) {
  const [sorting, setSorting] = useState<SortingState>([{ id: "code", desc: false }]);
  const [filter, setFilter] = useState("");
  const columns = useMemo(
    () => [
      column.accessor("code", { header: "Cell" }),
      column.accessor("siteName", { header: "Site" }),
      column.accessor("azimuthDeg", { header: "Azimuth °", cell: fixed(1), meta: { numeric: true } }),
      column.accessor("mechanicalTiltDeg", { header: "M-tilt °", cell: fixed(1), meta: { numeric: true } }),
      column.accessor("electricalTiltDeg", { header: "E-tilt °", cell: fixed(1), meta: { numeric: true } }),
      column.accessor("beamSetId", { header: "Beam set" }),
      column.accessor("rsPowerDbm", { header: "RS power dBm", cell: fixed(1), meta: { numeric: true } }),
      column.accessor("antennaHeightM", { header: "Height m", cell: fixed(1), meta: { numeric: true } }),
      column.accessor("frequencyMHz", { header: "MHz", meta: { numeric: true } }),
      column.accessor("bandwidthMHz", { header: "BW MHz", meta: { numeric: true } }),
      column.accessor("antennaModel", { header: "Antenna" }),
    ],
    [],
  );
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
              <tr key={row.id}>
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
