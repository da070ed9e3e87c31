// `npm run --silent simulate -- --scenario DIR --out FILE.json [--changes FILE] [--grids FILE.csv] [--threads N]`
//
// Runs the coverage model on a scenario folder (lib/io/scenario-format.md) and writes the
// KPIs (network, clusters, best-server area per cell) as JSON; with --changes (a JSON array
// of {cellId, parameter, value} or a CSV of cell, parameter, new value) also the impact:
// KPI deltas and the ranked worst grids. --grids writes one CSV row per grid. Output files
// are written only once everything has been computed: a failure leaves none behind.
import fs from "node:fs";
import path from "node:path";
import { readScenarioFolder, ScenarioFormatError, describeProblem } from "../../io/scenarioFolder";
import { parseBulkChangesCsv } from "../../io/bulkChanges";
import { prepareEngineThreaded } from "../simulationThreads";
import { compareRuns } from "../../radio/impact";
import { validateChanges } from "../../radio/validation";
import { CELL_PARAMETERS, type CellParameter, type ParameterChange } from "../../radio/scenario";
import type { KpiResult } from "../../radio/kpi";
import type { Grid } from "../../radio/grid";

interface Options {
  scenario: string;
  out: string;
  changes?: string;
  grids?: string;
  threads?: number;
}

class UsageError extends Error {}

function parseArgs(argv: string[]): Options {
  const options: Partial<Options> = {};
  for (let i = 0; i < argv.length; i++) {
    const flag = argv[i];
    const value = argv[i + 1];
    const take = () => {
      if (value === undefined || value.startsWith("--")) throw new UsageError(`${flag} needs a value`);
      i++;
      return value;
    };
    if (flag === "--scenario") options.scenario = take();
    else if (flag === "--out") options.out = take();
    else if (flag === "--changes") options.changes = take();
    else if (flag === "--grids") options.grids = take();
    else if (flag === "--threads") {
      const n = Number(take());
      if (!Number.isInteger(n) || n < 0) throw new UsageError(`--threads must be a whole number ≥ 0, got ${value}`);
      options.threads = n;
    } else throw new UsageError(`unknown option ${flag}`);
  }
  if (!options.scenario) throw new UsageError("--scenario DIR is required");
  if (!options.out) throw new UsageError("--out FILE.json is required");
  return options as Options;
}

/** Reads a change file: a JSON array of {cellId, parameter, value}, or a CSV (cell, parameter, new value). */
export function readChanges(file: string): ParameterChange[] {
  const text = fs.readFileSync(file, "utf8");
  const name = path.basename(file);
  if (file.toLowerCase().endsWith(".csv")) {
    const parsed = parseBulkChangesCsv(text, name);
    const errors = parsed.problems.filter((p) => p.severity === "error");
    if (errors.length > 0) throw new ScenarioFormatError(errors);
    return parsed.items.map((item) => ({ cellId: item.cellId, parameter: item.parameter, value: item.newValue }));
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (error) {
    throw new RangeError(`${name}: not valid JSON (${(error as Error).message})`);
  }
  if (!Array.isArray(json)) throw new RangeError(`${name}: expected a JSON array of {cellId, parameter, value}`);
  return json.map((entry, i) => {
    const e = entry as Record<string, unknown>;
    if (typeof e?.cellId !== "string") throw new RangeError(`${name}: entry ${i + 1}, field cellId: expected a cell id, got ${JSON.stringify(e?.cellId)}`);
    if (!(CELL_PARAMETERS as readonly unknown[]).includes(e.parameter)) {
      throw new RangeError(`${name}: entry ${i + 1}, field parameter: ${JSON.stringify(e.parameter)} is not one of ${CELL_PARAMETERS.join(", ")}`);
    }
    if (typeof e.value !== "number" && typeof e.value !== "string") throw new RangeError(`${name}: entry ${i + 1}, field value: expected a number or beam-set id`);
    return { cellId: e.cellId, parameter: e.parameter as CellParameter, value: e.value };
  });
}

function finite(value: number): number | null {
  return Number.isFinite(value) ? value : null;
}

function gridCsv(grid: Grid, cellIds: readonly string[], clusterIds: readonly string[], before: KpiResult, after?: KpiResult): string {
  const header = ["grid", "x_m", "y_m", "z_m", "floor", "cluster", "best_cell", "best_rsrp_dbm", "sinr_db"];
  if (after) header.push("best_cell_after", "best_rsrp_after_dbm", "sinr_after_db");
  const lines = [header.join(",")];
  const text = (v: number) => (Number.isFinite(v) ? String(Math.round(v * 100) / 100) : "");
  for (let g = 0; g < grid.count; g++) {
    const row = [
      g,
      grid.x[g],
      grid.y[g],
      Math.round(grid.z[g] * 100) / 100,
      grid.floor[g],
      grid.clusterIndex[g] >= 0 ? clusterIds[grid.clusterIndex[g]] : "",
      before.perGrid.bestCell[g] >= 0 ? cellIds[before.perGrid.bestCell[g]] : "",
      text(before.perGrid.bestRsrpDbm[g]),
      text(before.perGrid.sinrDb[g]),
    ];
    if (after) {
      row.push(after.perGrid.bestCell[g] >= 0 ? cellIds[after.perGrid.bestCell[g]] : "", text(after.perGrid.bestRsrpDbm[g]), text(after.perGrid.sinrDb[g]));
    }
    lines.push(row.join(","));
  }
  return `${lines.join("\n")}\n`;
}

function writeAtomically(file: string, content: string): void {
  const temp = `${file}.${process.pid}.tmp`;
  fs.writeFileSync(temp, content);
  fs.renameSync(temp, file);
}

async function main(): Promise<void> {
  const options = parseArgs(process.argv.slice(2));
  const started = performance.now();
  const scenario = await readScenarioFolder(options.scenario);
  const changes = options.changes ? readChanges(options.changes) : [];
  // Refuse a bad change before the expensive part.
  validateChanges(scenario, changes);
  const engine = await prepareEngineThreaded(scenario, { ...(options.threads !== undefined ? { threads: options.threads } : {}) });
  const coldMs = performance.now() - started;
  const cellIds = scenario.cells.map((c) => c.id);
  const clusterIds = scenario.clusters.map((c) => c.id);
  const baseline = engine.baseline.kpis;
  const output: Record<string, unknown> = {
    scenario: scenario.name,
    grids: engine.grid.count,
    cells: scenario.cells.length,
    note: "SINR is per resource element: the noise is that of one subcarrier, like the RSRP it is computed from.",
    kpis: { network: baseline.network, clusters: baseline.clusters, cells: baseline.cells },
  };
  let after: KpiResult | undefined;
  if (options.changes) {
    const t0 = performance.now();
    const run = engine.evaluate(changes);
    after = run.kpis;
    const report = compareRuns(engine.grid, cellIds, clusterIds, baseline, after, { worstGridDropDb: scenario.settings.worstGridDropDb });
    output.changes = changes;
    output.impact = report;
    output.timings = { coldMs: Math.round(coldMs), incrementalMs: Math.round(performance.now() - t0) };
  } else {
    output.timings = { coldMs: Math.round(coldMs) };
  }
  const json = JSON.stringify(output, (_key, value) => (typeof value === "number" ? finite(value) : value), 2);
  const csv = options.grids ? gridCsv(engine.grid, cellIds, clusterIds, baseline, after) : undefined;
  writeAtomically(options.out, `${json}\n`);
  if (csv !== undefined && options.grids) writeAtomically(options.grids, csv);
  console.log(
    `simulated ${scenario.name}: ${engine.grid.count} grids, ${scenario.cells.length} cells` +
      `${options.changes ? `, ${changes.length} changes` : ""} → ${options.out}${options.grids ? ` and ${options.grids}` : ""}`,
  );
}

main().catch((error) => {
  if (error instanceof ScenarioFormatError) {
    console.error(`simulate: the scenario has ${error.problems.length} problem(s):`);
    for (const p of error.problems.slice(0, 50)) console.error(`  ${describeProblem(p)}`);
  } else if (error instanceof UsageError) {
    console.error(`simulate: ${error.message}\nusage: npm run --silent simulate -- --scenario DIR --out FILE.json [--changes FILE] [--grids FILE.csv] [--threads N]`);
  } else {
    console.error(`simulate: ${(error as Error).message}`);
  }
  process.exit(1);
});
