// Writes a network from the database as an open scenario folder (../scenario-format.md):
//   npx tsx lib/io/cli/exportNetwork.ts DIR [--network NAME]
// Without --network the database must hold exactly one network. The current parameter values
// are written (the latest version). Quiet except for one final line naming the folder and the counts.

import path from "node:path";
import { writeScenarioFolder } from "../scenarioFolder";
import { openDatabase } from "../../db/open";
import { describeTarget, resolveDatabaseTarget } from "../../db/target";
import { listNetworks, loadScenario } from "../../db/networks/data";

const USAGE = "usage: npx tsx lib/io/cli/exportNetwork.ts DIR [--network NAME]";

function parseArgs(argv: string[]): { dir: string; network?: string } {
  let dir: string | undefined;
  let network: string | undefined;
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    if (arg === "--network" || arg.startsWith("--network=")) {
      const raw = arg === "--network" ? argv[++i] : arg.slice("--network=".length);
      if (raw === undefined || raw.trim() === "") throw new Error(`--network needs a network name\n${USAGE}`);
      network = raw.trim();
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
  return { dir, ...(network !== undefined ? { network } : {}) };
}

async function main(): Promise<void> {
  const { dir, network } = parseArgs(process.argv.slice(2));
  const target = resolveDatabaseTarget();
  const db = await openDatabase(target);
  try {
    const networks = await listNetworks(db.prisma);
    const names = networks.map((n) => JSON.stringify(n.name)).join(", ") || "none";
    const chosen = network !== undefined ? networks.find((n) => n.name === network) : networks.length === 1 ? networks[0] : undefined;
    if (!chosen) {
      throw new Error(
        network !== undefined
          ? `no network named ${JSON.stringify(network)} in the ${describeTarget(target)} (networks: ${names})`
          : `the ${describeTarget(target)} holds ${networks.length} networks (${names}); name one with --network NAME`,
      );
    }
    const scenario = await loadScenario(db.prisma, chosen.id);
    await writeScenarioFolder(dir, scenario);
    console.log(
      `Wrote "${scenario.name}" version ${chosen.latestVersion} to ${path.resolve(dir)}: ${scenario.sites.length} sites, ` +
        `${scenario.cells.length} cells, ${scenario.buildings.length} buildings, ${scenario.clusters.length} clusters`,
    );
  } finally {
    await db.close();
  }
}

main().catch((e: unknown) => {
  console.error(e instanceof Error ? e.message : String(e));
  process.exitCode = 1;
});
