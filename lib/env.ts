import { z } from "zod";

// Server environment, validated once. Each variable says why it exists.
const serverSchema = z.object({
  /** Where the data lives: unset/"embedded" = PGlite in BEAMGATE_DATA_DIR; postgresql://… = a server. */
  DATABASE_URL: z.string().optional(),
  /** Folder of the embedded database and the demo's generated secret. */
  BEAMGATE_DATA_DIR: z.string().optional(),
  /** Signs and encrypts session cookies; the demo generates one into the data folder. */
  NEXTAUTH_SECRET: z.string().min(32, "NEXTAUTH_SECRET must be at least 32 characters"),
  /** Public URL of the app, for next-auth's redirects. */
  NEXTAUTH_URL: z.string().url().optional(),
  /** Simulation runner: in-process worker threads (default) or the PostgreSQL job queue. */
  BEAMGATE_JOB_RUNNER: z.enum(["threads", "queue"]).default("threads"),
  /** Worker threads for a cold simulation run (default: all cores). */
  BEAMGATE_SIMULATION_THREADS: z.coerce.number().int().min(1).max(64).optional(),
});

export type ServerEnv = z.infer<typeof serverSchema>;

let cached: ServerEnv | undefined;

export function serverEnv(): ServerEnv {
  if (cached) return cached;
  const parsed = serverSchema.safeParse(process.env);
  if (!parsed.success) {
    const problems = parsed.error.issues.map((issue) => `${issue.path.join(".")}: ${issue.message}`).join("; ");
    throw new Error(`Beamgate configuration is invalid: ${problems}`);
  }
  cached = parsed.data;
  return cached;
}

/**
 * BEAMGATE_SIMULATION_THREADS alone, validated by the same rule: the engine cache also runs outside the web
 * server (CLI, tests), where the rest of the server environment (NEXTAUTH_SECRET) need not be set.
 */
export function simulationThreadsSetting(env: NodeJS.ProcessEnv = process.env): number | undefined {
  const parsed = serverSchema.shape.BEAMGATE_SIMULATION_THREADS.safeParse(env.BEAMGATE_SIMULATION_THREADS);
  if (!parsed.success) {
    throw new Error(`Beamgate configuration is invalid: BEAMGATE_SIMULATION_THREADS: ${parsed.error.issues.map((i) => i.message).join("; ")} (got "${env.BEAMGATE_SIMULATION_THREADS}")`);
  }
  return parsed.data;
}
