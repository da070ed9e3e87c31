"use client";
import { flexRender, type Table } from "@tanstack/react-table";

export interface ColumnMetaShape {
  numeric?: boolean;
}

export function isNumeric(meta: unknown): boolean {
  return Boolean((meta as ColumnMetaShape | undefined)?.numeric);
}

/** The thead of a TanStack table, column groups included; leaf headers sort on click (shift-click adds a key). */
export function SortableHead<T>({ table }: { table: Table<T> }) {
  return (
    <thead>
      {table.getHeaderGroups().map((group) => (
        <tr key={group.id}>
          {group.headers.map((header) => {
            if (header.isPlaceholder) return <th key={header.id} colSpan={header.colSpan} />;
            const numeric = isNumeric(header.column.columnDef.meta);
            const sortable = header.column.getCanSort();
            const sorted = header.column.getIsSorted();
            const label = flexRender(header.column.columnDef.header, header.getContext());
            return (
              <th
                key={header.id}
                colSpan={header.colSpan}
                className={[numeric ? "num" : "", header.colSpan > 1 ? "group" : ""].join(" ").trim() || undefined}
                aria-sort={sortable ? (sorted ? (sorted === "asc" ? "ascending" : "descending") : "none") : undefined}
              >
                {sortable ? (
                  <button type="button" onClick={header.column.getToggleSortingHandler()} title="Sort (shift-click to add)">
                    {label}
                    {sorted === "asc" ? " ▲" : sorted === "desc" ? " ▼" : ""}
                  </button>
                ) : (
                  label
                )}
              </th>
            );
          })}
        </tr>
      ))}
    </thead>
  );
}
