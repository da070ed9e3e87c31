// Network import benchmark: generates the seeded import fixture (an invented town in the open
// South Pacific, 540 cells, 10 000 buildings, EPSG:4326 terrain) into a temporary folder, reads
// it back from disk and runs parseNetworkUpload on it. Prints one JSON object:
//   {rows, totalMs, rowsPerSec, peakRssMb}
// totalMs covers reading the files and the parse; the fixture generation is not timed.
//   npx tsx test/bench/import.bench.ts

import { mkdtemp, readdir, readFile, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import { generateImportFixture } from "../../lib/io/fixtures/importFixture";
import { parseNetworkUpload } from "../../lib/io/networkImport";

async function main(): Promise<void> {
  const dir = await mkdtemp(path.join(tmpdir(), "beamgate-import-bench-"));
  try {
    for (const f of generateImportFixture({ seed: 11 })) await writeFile(path.join(dir, f.name), f.bytes);
    let peakRss = process.memoryUsage().rss;
    const sampler = setInterval(() => (peakRss = Math.max(peakRss, process.memoryUsage().rss)), 20);
    const start = performance.now();
    const files = [];
    for (const name of await readdir(dir)) files.push({ name, bytes: new Uint8Array(await readFile(path.join(dir, name))) });
    const result = await parseNetworkUpload(files, { name: "import bench" });
    const totalMs = performance.now() - start;
    clearInterval(sampler);
    peakRss = Math.max(peakRss, process.memoryUsage().rss);
    if (!result.scenario) {
      throw new Error(`the fixture did not import:\n${result.report.errors.slice(0, 10).map((p) => JSON.stringify(p)).join("\n")}`);
    }
    const rows = result.report.counts.rows;
    console.log(
      JSON.stringify({
        rows,
        totalMs: Math.round(totalMs),
        rowsPerSec: Math.round(rows / (totalMs / 1000)),
        peakRssMb: Math.round(peakRss / 1024 / 1024),
      }),
    );
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
}

main().catch((e: unknown) => {
  console.error(e instanceof Error ? e.stack ?? e.message : String(e));
  process.exit(1);
});
