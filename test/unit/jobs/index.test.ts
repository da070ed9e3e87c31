// Which runner getSimulationJobs picks: the queue only when asked for and on a PostgreSQL server.
import { describe, expect, it, vi } from "vitest";
import { jobRunnerKind } from "../../../lib/jobs";

const server = { kind: "postgres" as const, url: "postgresql://u@h/db", host: "h:5432", database: "db" };

describe("jobRunnerKind(target, env)", () => {
  it("is the queue only for BEAMGATE_JOB_RUNNER=queue on a PostgreSQL server", () => {
    expect(jobRunnerKind(server, { BEAMGATE_JOB_RUNNER: "queue" })).toBe("queue");
    expect(jobRunnerKind(server, {})).toBe("threads");
    expect(jobRunnerKind(server, { BEAMGATE_JOB_RUNNER: "threads" })).toBe("threads");
    const warn = vi.spyOn(console, "warn").mockImplementation(() => {});
    expect(jobRunnerKind({ kind: "memory" }, { BEAMGATE_JOB_RUNNER: "queue" })).toBe("threads");
    expect(warn).toHaveBeenCalledWith(expect.stringMatching(/needs a PostgreSQL server/));
    warn.mockRestore();
  });

  it("refuses an unknown runner, naming the value", () => {
    expect(() => jobRunnerKind(server, { BEAMGATE_JOB_RUNNER: "cluster" })).toThrow(/BEAMGATE_JOB_RUNNER.*"cluster"/);
  });
});
