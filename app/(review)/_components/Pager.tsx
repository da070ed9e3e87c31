"use client";
import type { Table } from "@tanstack/react-table";

/** Previous / next and page size for a paginated TanStack table. */
export function Pager<T>({ table, noun }: { table: Table<T>; noun: string }) {
  const { pageIndex, pageSize } = table.getState().pagination;
  const total = table.getPrePaginationRowModel().rows.length;
  const pages = Math.max(1, table.getPageCount());
  const first = total === 0 ? 0 : pageIndex * pageSize + 1;
  const last = Math.min(total, (pageIndex + 1) * pageSize);
  return (
    <div className="pager">
      <button type="button" className="secondary" onClick={() => table.previousPage()} disabled={!table.getCanPreviousPage()}>
        ‹ Previous
      </button>
      <span>
        Page {Math.min(pageIndex + 1, pages)} of {pages}
      </span>
      <button type="button" className="secondary" onClick={() => table.nextPage()} disabled={!table.getCanNextPage()}>
        Next ›
      </button>
      <span className="muted">
        {first}–{last} of {total} {noun}
      </span>
      <select aria-label="Rows per page" value={pageSize} onChange={(e) => table.setPageSize(Number(e.target.value))}>
        {[10, 20, 50, 100].map((n) => (
          <option key={n} value={n}>{n} per page</option>
        ))}
      </select>
    </div>
  );
}
