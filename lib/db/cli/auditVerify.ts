// `npm run --silent audit:verify`: checks the audit hash chain of the configured database.
// Prints one line; exit 0 when intact, 1 when broken (naming the first broken link), 2 on error.
import { openDatabase } from "../open";
import { resolveDatabaseTarget, describeTarget } from "../target";
import { verifyAuditChain } from "../audit";

async function main() {
  const target = resolveDatabaseTarget();
  const db = await openDatabase(target);
  try {
    const verdict = await verifyAuditChain(db.prisma);
    if (verdict.ok) {
      console.log(`audit chain intact: ${verdict.count} events in ${describeTarget(target)}`);
      return 0;
    }
    console.log(`audit chain BROKEN at event ${verdict.brokenAt} (${verdict.reason}): ${verdict.message}`);
    return 1;
  } finally {
    await db.close();
  }
}

main().then(
  (code) => process.exit(code),
  (error) => {
    console.error(`beamgate: audit:verify failed: ${(error as Error).message}`);
    process.exit(2);
  },
);
