import { execFile } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { promisify } from "node:util";
import { beforeAll, describe, expect, it } from "vitest";
import { generateDemoTown } from "../../../lib/io/demoTown";
import { writeScenarioFolder } from "../../../lib/io/scenarioFolder";

const run = promisify(execFile);
const cli = path.join(process.cwd(), "lib/jobs/cli/simulate.ts");
const tsx = path.join(process.cwd(), "node_modules/.bin/tsx");

async function simulate(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  try {
    const { stdout, stderr } = await run(tsx, [cli, ...args], { timeout: 120_000 });
    return { code: 0, stdout, stderr };
  } catch (error) {
    const e = error as { code: number; stdout: string; stderr: string };
    return { code: e.code, stdout: e.stdout, stderr: e.stderr };
  }
}

describe("npm run simulate (lib/jobs/cli/simulate.ts)", () => {
  let dir: string;
  beforeAll(async () => {
    dir = fs.mkdtempSync(path.join(os.tmpdir(), "beamgate-sim-"));
    const scenario = generateDemoTown(7);
    // A coarse grid keeps the test quick; the model is the same.
    scenario.settings = { ...scenario.settings, gridSizeM: 25 };
    await writeScenarioFolder(path.join(dir, "town"), scenario);
  });

  it("simulate --scenario --changes --grids writes KPIs, the impact and one CSV row per grid", async () => {
    const changes = path.join(dir, "changes.csv");
    fs.writeFileSync(changes, "cell,parameter,new_value\nCEN01-A,electrical_tilt,14\n");
    const out = path.join(dir, "out.json");
    const grids = path.join(dir, "grids.csv");
    const result = await simulate(["--scenario", path.join(dir, "town"), "--out", out, "--changes", changes, "--grids", grids, "--threads", "0"]);
    expect(result.stderr).toBe("");
    expect(result.code).toBe(0);
    const json = JSON.parse(fs.readFileSync(out, "utf8"));
    expect(json.cells).toBe(39);
    expect(json.kpis.clusters).toHaveLength(4);
    expect(json.changes).toEqual([{ cellId: "CEN01-A", parameter: "electricalTiltDeg", value: 14 }]);
    expect(json.impact.network.delta).toHaveProperty("coverageRatio");
    const lines = fs.readFileSync(grids, "utf8").trim().split("\n");
    expect(lines).toHaveLength(json.grids + 1);
    expect(lines[0]).toContain("best_rsrp_after_dbm");
  });

  it("a change naming an unknown cell fails with the cell named, and writes no output", async () => {
    const changes = path.join(dir, "bad.json");
    fs.writeFileSync(changes, JSON.stringify([{ cellId: "NOPE-1", parameter: "azimuthDeg", value: 10 }]));
    const out = path.join(dir, "never.json");
    const result = await simulate(["--scenario", path.join(dir, "town"), "--out", out, "--changes", changes]);
    expect(result.code).toBe(1);
    expect(result.stderr).toContain('"NOPE-1"');
    expect(fs.existsSync(out)).toBe(false);
  });

  it("a malformed scenario file is reported with file, row and column", async () => {
    const broken = path.join(dir, "broken");
    fs.cpSync(path.join(dir, "town"), broken, { recursive: true });
    const cells = path.join(broken, "cells.csv");
    const lines = fs.readFileSync(cells, "utf8").split("\n");
    lines[2] = lines[2].replace(/,[^,]*$/, ",abc");
    fs.writeFileSync(cells, lines.join("\n"));
    const result = await simulate(["--scenario", broken, "--out", path.join(dir, "x.json")]);
    expect(result.code).toBe(1);
    expect(result.stderr).toMatch(/cells\.csv row 3, column scs_khz/);
  });
});
