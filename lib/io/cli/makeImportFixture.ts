// Writes the generated network import set (invented town in the open South Pacific; see
// ../fixtures/importFixture.ts) into DIR, ready to upload:
//   npx tsx lib/io/cli/makeImportFixture.ts DIR [--seed N]
// Quiet except for one final line naming the folder and the counts.

import { mkdir, writeFile } from "node:fs/promises";
import path from "node:path";
import { generateImportFixture } from "../fixtures/importFixture";

const USAGE = "usage: npx tsx lib/io/cli/makeImportFixture.ts DIR [--seed N]";

function parseArgs(argv: string[]): { dir: string; seed: number } {
  let dir: string | undefined;
  let seed = 11;
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    if (arg === "--seed" || arg.startsWith("--seed=")) {
      const raw = arg === "--seed" ? argv[++i] : arg.slice("--seed=".length);
      if (raw === undefined || !/^-?\d+$/.test(raw)) throw new Error(`--seed needs a whole number, got ${JSON.stringify(raw ?? "")}\n${USAGE}`);
      seed = Number(raw);
    } else if (arg.startsWith("-")) {
      throw new Error(arg === "--help" || arg === "-h" ? USAGE : `unknown option ${arg}\n${USAGE}`);
    } else if (dir === undefined) {
      dir = arg;
    } else {
      throw new Error(`only one DIR expected, got ${JSON.stringify(dir)} and ${JSON.stringify(arg)}\n${USAGE}`);
    }
  }
  if (dir === undefined) throw new Error(USAGE);
  return { dir, seed };
}

async function main(): Promise<void> {
  const { dir, seed } = parseArgs(process.argv.slice(2));
  const files = generateImportFixture({ seed });
  await mkdir(dir, { recursive: true });
  for (const f of files) await writeFile(path.join(dir, f.name), f.bytes);
  const lines = (name: string): number => new TextDecoder().decode(files.find((f) => f.name === name)!.bytes).trim().split("\n").length - 1;
  console.log(
    `Wrote the import fixture (seed ${seed}) to ${path.resolve(dir)}: ${lines("sites.csv")} sites, ${lines("cells.csv")} cells, ` +
      `${lines("buildings.geojson") - 1} buildings, ${files.map((f) => `${f.name} ${(f.bytes.length / 1024).toFixed(0)} kB`).join(", ")}`,
  );
}

main().catch((e: unknown) => {
  console.error(e instanceof Error ? e.message : String(e));
  process.exit(1);
});
