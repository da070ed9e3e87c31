// Writes the demo scenario as an open scenario folder (see ../scenario-format.md).
//   npx tsx lib/io/cli/exportScenario.ts DIR [--seed N]
// Quiet except for one final line naming the folder and the counts.

import path from "node:path";
import { generateDemoTown } from "../demoTown";
import { writeScenarioFolder } from "../scenarioFolder";

const USAGE = "usage: npx tsx lib/io/cli/exportScenario.ts DIR [--seed N]";

function parseArgs(argv: string[]): { dir: string; seed: number } {
  let dir: string | undefined;
  let seed = 7;
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    if (arg === "--seed" || arg.startsWith("--seed=")) {
      const raw = arg === "--seed" ? argv[++i] : arg.slice("--seed=".length);
      if (raw === undefined || !/^-?\d+$/.test(raw)) throw new Error(`--seed needs a whole number, got ${JSON.stringify(raw ?? "")}\n${USAGE}`);
      seed = Number(raw);
    } else if (arg === "--help" || arg === "-h") {
      throw new Error(USAGE);
    } else if (arg.startsWith("--")) {
      throw new Error(`unknown option ${arg}\n${USAGE}`);
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
  const scenario = generateDemoTown(seed);
  await writeScenarioFolder(dir, scenario);
  console.log(
    `Wrote "${scenario.name}" (seed ${seed}) to ${path.resolve(dir)}: ${scenario.sites.length} sites, ` +
      `${scenario.cells.length} cells, ${scenario.buildings.length} buildings, ${scenario.clusters.length} clusters`,
  );
}

main().catch((e: unknown) => {
  console.error(e instanceof Error ? e.message : String(e));
  process.exitCode = 1;
});
