// One check for "these two runs are the same bits": summaries deep-equal, every per-grid array byte for byte.
import { expect } from "vitest";
import type { KpiResult } from "../../lib/radio/kpi";

function bytesOf(a: ArrayBufferView): Buffer {
  return Buffer.from(a.buffer as ArrayBuffer, a.byteOffset, a.byteLength);
}

export function expectIdenticalKpis(a: KpiResult, b: KpiResult): void {
  expect(a.network).toEqual(b.network);
  expect(a.clusters).toEqual(b.clusters);
  expect(a.cells).toEqual(b.cells);
  for (const key of ["bestRsrpDbm", "bestCell", "sinrDb", "overlapOthers", "flags"] as const) expect(bytesOf(a.perGrid[key]).equals(bytesOf(b.perGrid[key])), key).toBe(true);
}
