import "server-only";
// The app's one database handle, opened on first use and kept on globalThis so that
// Next.js's module reloading in development does not open a second one.
import { openDatabase, type Database } from "./open";
import { resolveDatabaseTarget } from "./target";

const holder = globalThis as unknown as { beamgateDatabase?: Promise<Database> };

export function getDatabase(): Promise<Database> {
  if (!holder.beamgateDatabase) {
    holder.beamgateDatabase = openDatabase(resolveDatabaseTarget()).catch((error) => {
      holder.beamgateDatabase = undefined;
      throw error;
    });
  }
  return holder.beamgateDatabase;
}

export async function getPrisma() {
  return (await getDatabase()).prisma;
}
