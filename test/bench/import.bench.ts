// Network import benchmark: generates the seeded import fixture (an invented town in the open
// South Pacific, 540 cells, 10 000 buildings, EPSG:4326 terrain) into a temporary folder, reads
// it back from disk, runs parseNetworkUpload on it and writes it with importNetwork into a fresh
// embedded database (PGlite in a temporary folder, migrations applied before the clock starts).
// Prints one JSON object:
//   {rows, totalMs, parseMs, writeMs, rowsPerSec, peakRssMb}
// totalMs covers reading the files, the parse and the database write (one transaction, audit event
// included); the fixture generation and opening the database are not timed.
//   npx tsx test/bench/import.bench.ts

import { mkdir, mkdtemp, readdir, readFile, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { generateImportFixture } from "../../lib/io/fixtures/importFixture";
import { parseNetworkUpload } from "../../lib/io/networkImport";
import { openDatabase } from "../../lib/db/open";
import { importNetwork } from "../../lib/db/networks/import";

async function main(): Promise<void> {
  const dir = await mkdtemp(path.join(tmpdir(), "beamgate-import-bench-"));
  const dbDir = path.join(dir, "pglite");
  const filesDir = path.join(dir, "files");
  const db = await openDatabase({ kind: "embedded", dir: dbDir });
  try {
    await mkdir(filesDir);
    for (const f of generateImportFixture({ seed: 11 })) await writeFile(path.join(filesDir, f.name), f.bytes);
    let peakRss = process.memoryUsage().rss;
    const sampler = setInterval(() => (peakRss = Math.max(peakRss, process.memoryUsage().rss)), 20);
    const start = performance.now();
    const files = [];
    for (const name of await readdir(filesDir)) files.push({ name, bytes: new Uint8Array(await readFile(path.join(filesDir, name))) });
    const result = await parseNetworkUpload(files, { name: "import bench" });
    const parsed = performance.now();
    if (!result.scenario) {
      clearInterval(sampler);
      throw new Error(`the fixture did not import:\n${result.report.errors.slice(0, 10).map((p) => JSON.stringify(p)).join("\n")}`);
    }
    const saved = await importNetwork(db, { id: "bench", role: "system" }, result.scenario, {
      ...(result.projection ? { projection: result.projection } : {}),
      note: "import bench",
    });
    const end = performance.now();
    clearInterval(sampler);
    peakRss = Math.max(peakRss, process.memoryUsage().rss);
    if ((await db.prisma.building.count({ where: { networkId: saved.networkId } })) !== result.scenario.buildings.length) {
      throw new Error("the database holds a different number of buildings than were imported");
    }
    const rows = result.report.counts.rows;
    const totalMs = end - start;
    console.log(
      JSON.stringify({
        rows,
        totalMs: Math.round(totalMs),
        parseMs: Math.round(parsed - start),
        writeMs: Math.round(end - parsed),
        rowsPerSec: Math.round(rows / (totalMs / 1000)),
        peakRssMb: Math.round(peakRss / 1024 / 1024),
      }),
    );
  } finally {
    await db.close();
    await rm(dir, { recursive: true, force: true });
  }
}

main().catch((e: unknown) => {
  console.error(e instanceof Error ? e.stack ?? e.message : String(e));
  process.exit(1);
});
