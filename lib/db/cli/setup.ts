// `npm run setup [-- --demo] [-- --seed N]`: opens the configured database, applies
// pending migrations (idempotent) and, with --demo, seeds the demo town and its users,
// printing their sign-in details. Exits non-zero with one clear line on failure.
import fs from "node:fs";
import path from "node:path";
import { openDatabase } from "../open";
import { describeTarget, resolveDatabaseTarget } from "../target";
import { DatabaseError } from "../errors";
import { seedDemo, type DemoCredential } from "../seed";
import { dataDir, ensureDemoSecret } from "./dataDir";

async function main() {
  const args = process.argv.slice(2);
  const demo = args.includes("--demo");
  const seedIndex = args.indexOf("--seed");
  const seed = seedIndex >= 0 ? Number(args[seedIndex + 1]) : 7;
  if (!Number.isInteger(seed)) throw new Error(`--seed must be a whole number, got ${args[seedIndex + 1]}`);

  const target = resolveDatabaseTarget();
  const db = await openDatabase(target);
  try {
    console.log(`beamgate: ${describeTarget(target)} is up to date`);
    if (!demo) return;
    ensureDemoSecret();
    const credentialsFile = path.join(dataDir(), "demo-credentials.json");
    const known: DemoCredential[] = fs.existsSync(credentialsFile) ? JSON.parse(fs.readFileSync(credentialsFile, "utf8")) : [];
    const result = await seedDemo(db, seed, known);
    if (result.created) {
      fs.writeFileSync(credentialsFile, JSON.stringify(result.credentials, null, 2), { mode: 0o600 });
      console.log(`beamgate: seeded the demo network "${result.networkName}" (seed ${seed})`);
    } else {
      console.log(`beamgate: the demo network "${result.networkName}" is already there`);
    }
    if (result.credentials.length > 0) {
      console.log("\nDemo sign-in (generated passwords, kept in " + credentialsFile + "):");
      for (const c of result.credentials) console.log(`  ${c.role.padEnd(9)} ${c.email.padEnd(34)} ${c.password}   (${c.name})`);
      console.log("");
    }
  } finally {
    await db.close();
  }
}

main().catch((error) => {
  if (error instanceof DatabaseError) console.error(`beamgate: ${error.message}`);
  else console.error(`beamgate: setup failed: ${(error as Error).message}`);
  process.exit(1);
});
