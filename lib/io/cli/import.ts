// Imports a network from upload files (./../import-format.md) into the database:
//   npx tsx lib/io/cli/import.ts DIR|FILE... [--name NAME]
// DIR: every file directly in it (sub-folders are not read). Prints the validation report —
// errors, then warnings, each with file, row, column and reason. Any error: exit 1, nothing
// written. Otherwise one line with the counts and the new network's id.
// The database is the one the app uses (DATABASE_URL, else the embedded folder).

import { readdir, readFile, stat } from "node:fs/promises";
import path from "node:path";
import { parseNetworkUpload, type ImportReport, type UploadedFile } from "../networkImport";
import type { FormatProblem } from "../scenarioFolder";
import { openDatabase } from "../../db/open";
import { resolveDatabaseTarget, describeTarget } from "../../db/target";
import { importNetwork } from "../../db/networks/import";

const USAGE = "usage: npx tsx lib/io/cli/import.ts DIR|FILE... [--name NAME]";

function parseArgs(argv: string[]): { paths: string[]; name?: string } {
  const paths: string[] = [];
  let name: string | undefined;
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    if (arg === "--name" || arg.startsWith("--name=")) {
      const raw = arg === "--name" ? argv[++i] : arg.slice("--name=".length);
      if (raw === undefined || raw.trim() === "") throw new Error(`--name needs a network name\n${USAGE}`);
      name = raw.trim();
    } else if (arg === "--help" || arg === "-h") {
      throw new Error(USAGE);
    } else if (arg.startsWith("--")) {
      throw new Error(`unknown option ${arg}\n${USAGE}`);
    } else {
      paths.push(arg);
    }
  }
  if (paths.length === 0) throw new Error(USAGE);
  return { paths, ...(name !== undefined ? { name } : {}) };
}

async function readUpload(paths: readonly string[]): Promise<UploadedFile[]> {
  const files: UploadedFile[] = [];
  for (const p of paths) {
    const info = await stat(p).catch(() => {
      throw new Error(`${p}: no such file or folder`);
    });
    if (info.isDirectory()) {
      for (const entry of (await readdir(p, { withFileTypes: true })).sort((a, b) => (a.name < b.name ? -1 : 1))) {
        if (entry.isFile()) files.push({ name: entry.name, bytes: new Uint8Array(await readFile(path.join(p, entry.name))) });
      }
    } else {
      files.push({ name: path.basename(p), bytes: new Uint8Array(await readFile(p)) });
    }
  }
  return files;
}

function problemLine(p: FormatProblem): string {
  const parts = [p.file, p.row !== undefined ? `row ${p.row}` : "", p.column !== undefined ? `column ${p.column}` : ""].filter(Boolean);
  const value = p.value !== undefined ? ` (value ${JSON.stringify(p.value)})` : "";
  return `  ${parts.join(", ")}: ${p.reason}${value}`;
}

/** The report as text: errors, then warnings. */
export function formatImportReport(report: ImportReport): string {
  const lines: string[] = [];
  if (report.errors.length > 0) lines.push(`${report.errors.length} error${report.errors.length === 1 ? "" : "s"}:`, ...report.errors.map(problemLine));
  if (report.warnings.length > 0) lines.push(`${report.warnings.length} warning${report.warnings.length === 1 ? "" : "s"}:`, ...report.warnings.map(problemLine));
  return lines.join("\n");
}

async function main(): Promise<void> {
  const { paths, name } = parseArgs(process.argv.slice(2));
  const files = await readUpload(paths);
  const result = await parseNetworkUpload(files, name !== undefined ? { name } : {});
  const text = formatImportReport(result.report);
  if (text) (result.scenario ? console.log : console.error)(text);
  if (!result.scenario) {
    console.error("Nothing was imported.");
    process.exitCode = 1;
    return;
  }
  const target = resolveDatabaseTarget();
  const db = await openDatabase(target);
  try {
    const saved = await importNetwork(db, { id: "cli", role: "system" }, result.scenario, {
      ...(result.projection ? { projection: result.projection } : {}),
      note: `imported from ${paths.join(", ")} with the command line`,
    });
    const c = saved.counts;
    console.log(
      `Imported "${saved.name}" into the ${describeTarget(target)}: ${c.sites} sites, ${c.cells} cells, ${c.buildings} buildings, ` +
        `${c.clusters} clusters, ${result.report.warnings.length} warnings; network id ${saved.networkId}`,
    );
  } finally {
    await db.close();
  }
}

main().catch((e: unknown) => {
  console.error(e instanceof Error ? e.message : String(e));
  process.exitCode = 1;
});
