import Link from "next/link";
import { runtime } from "@/app/_lib/runtime";
import { listCells, listNetworks, type CellRow } from "@/lib/db/networks/data";
import { listVersions, networkAsOf } from "@/lib/db/history";
import { CELL_PARAMETERS, type CellParameter } from "@/lib/radio/scenario";
import { pageActor } from "../../_components/guard";
import { Forbidden } from "../../_components/Forbidden";
import { utcDateTime } from "../../_components/format";
import { CellsTable, type CellDifferences } from "../_components/CellsTable";
import { PARAMETER_DISPLAY, parameterText } from "../_components/parameters";

export const dynamic = "force-dynamic";

type Moment = { kind: "date"; at: Date } | { kind: "version"; version: number };

/** Cells whose differences are also listed above the table. */
const MAX_LISTED = 12;

const pad = (n: number) => String(n).padStart(2, "0");

/** The value a datetime-local input shows for a moment, in UTC, to the second. */
function inputValue(date: Date): string {
  return `${date.getUTCFullYear()}-${pad(date.getUTCMonth() + 1)}-${pad(date.getUTCDate())}T${pad(date.getUTCHours())}:${pad(date.getUTCMinutes())}:${pad(date.getUTCSeconds())}`;
}

/** A datetime-local value has no zone: the page works in UTC, so it is read as UTC. A full ISO 8601 time is read as given. */
function parseMoment(text: string): Date | null {
  const trimmed = text.trim();
  const local = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d{1,3})?)?$/.test(trimmed);
  const date = new Date(local ? `${trimmed}Z` : trimmed);
  return /^\d{4}-\d{2}-\d{2}/.test(trimmed) && !Number.isNaN(date.getTime()) ? date : null;
}

function differencesOf(then: CellRow[], today: CellRow[]): { differences: CellDifferences; parameterCount: number } {
  const todayByCode = new Map(today.map((c) => [c.code, c]));
  const differences: CellDifferences = {};
  let parameterCount = 0;
  for (const row of then) {
    const now = todayByCode.get(row.code);
    if (!now) continue;
    for (const parameter of CELL_PARAMETERS) {
      if (row[parameter] === now[parameter]) continue;
      (differences[row.code] ??= {})[parameter] = now[parameter];
      parameterCount++;
    }
  }
  return { differences, parameterCount };
}

export default async function NetworkAsOfPage({ searchParams }: { searchParams: Promise<{ at?: string | string[]; version?: string | string[] }> }) {
  const gate = await pageActor("network.read");
  if (!gate.ok) return <Forbidden permission={gate.permission} />;
  const query = await searchParams;
  const atText = typeof query.at === "string" ? query.at : undefined;
  const versionText = typeof query.version === "string" && query.version !== "" ? query.version : undefined;

  const { db } = await runtime();
  const [network] = await listNetworks(db.prisma);
  if (!network) {
    return (
      <main>
        <h1>Network as of a date</h1>
        <p className="subtitle">No network yet: an administrator imports one, or run the demo seed.</p>
      </main>
    );
  }
  const versions = await listVersions(db.prisma, network.id);

  // ---- which moment: a version, a date, or (neither given) now
  let atError: string | null = null;
  let versionError: string | null = null;
  let moment: Moment | null = null;
  if (versionText !== undefined) {
    const number = Number(versionText);
    if (!Number.isInteger(number) || !versions.some((v) => v.number === number)) {
      versionError = `There is no version ${JSON.stringify(versionText)}; choose one from the list.`;
    } else moment = { kind: "version", version: number };
  } else if (atText !== undefined && atText.trim() !== "") {
    const at = parseMoment(atText);
    if (!at) atError = `${JSON.stringify(atText)} is not a date and time; use the picker or e.g. 2026-03-14T09:00:00Z.`;
    else moment = { kind: "date", at };
  } else {
    moment = { kind: "date", at: new Date() };
  }

  const today = await listCells(db.prisma, network.id);
  const then = moment ? await networkAsOf(db.prisma, network.id, moment.kind === "date" ? moment.at : moment.version) : [];
  const { differences, parameterCount } = differencesOf(then, today);
  const changedCells = Object.keys(differences).length;
  const firstVersion = versions[versions.length - 1];
  const shownVersion = moment?.kind === "version" ? versions.find((v) => v.number === moment.version) : undefined;
  // a chosen version fills the date field with its own time (rounded up to the second the field
  // holds, so that showing that date shows the version), and the two pickers agree
  const atValue = moment?.kind === "date" ? inputValue(moment.at) : shownVersion ? inputValue(new Date(Math.ceil(Date.parse(shownVersion.createdAt) / 1000) * 1000)) : (atText ?? "");

  return (
    <main>
      <p className="crumbs">
        <Link href="/network">{network.name}</Link> › as of a date
      </p>
      <h1>The network as of a moment</h1>
      <p className="subtitle">Every parameter value the network has had stays on record; pick a moment or a version to see the cells as they were.</p>

      <div className="panel asof-pickers">
        <form method="get" action="/network/as-of" className="asof-form">
          <label htmlFor="asof-at">Date and time (UTC)</label>
          <div className="inline-field">
            <input id="asof-at" name="at" type="datetime-local" step={1} defaultValue={atValue} aria-invalid={atError ? true : undefined} aria-describedby={atError ? "asof-at-error" : undefined} />
            <button type="submit" className="primary">
              Show
            </button>
          </div>
          {atError && (
            <div className="field-error" id="asof-at-error" role="alert">
              {atError}
            </div>
          )}
        </form>
        <div className="asof-or muted">or</div>
        <form method="get" action="/network/as-of" className="asof-form">
          <label htmlFor="asof-version">Version</label>
          <div className="inline-field">
            <select id="asof-version" name="version" defaultValue={moment?.kind === "version" ? String(moment.version) : (versionText ?? "")}>
              <option value="" disabled>
                Choose a version…
              </option>
              {versions.map((v) => (
                <option key={v.number} value={v.number}>
                  {`Version ${v.number} · ${utcDateTime(v.createdAt)} · ${v.requestNumber !== null ? `request #${v.requestNumber}` : v.kind}${v.note ? ` · ${v.note}` : ""}`}
                </option>
              ))}
            </select>
            <button type="submit" className="primary">
              Show
            </button>
          </div>
          {versionError && (
            <div className="field-error" role="alert">
              {versionError}
            </div>
          )}
        </form>
      </div>

      {moment && (
        <section className="panel" aria-labelledby="asof-heading">
          <h2 id="asof-heading" className="panel-title" data-testid="asof-heading">
            {moment.kind === "date" ? `As of ${utcDateTime(moment.at.toISOString())}` : `Version ${moment.version}`}
            {shownVersion && <span className="muted"> · created {utcDateTime(shownVersion.createdAt)}</span>}
          </h2>
          {then.length === 0 ? (
            <div className="banner info" data-testid="asof-empty">
              No cell was on record at that moment.
              {firstVersion && ` The first version of ${network.name} was recorded at ${utcDateTime(firstVersion.createdAt)}.`}
            </div>
          ) : (
            <>
              <p className="panel-note" data-testid="asof-summary">
                {then.length} of {today.length} cells of today existed then.{" "}
                {changedCells === 0 ? (
                  "Every parameter had the value it has today."
                ) : (
                  <>
                    <span className="cell-differs">
                      {parameterCount} parameter value{parameterCount === 1 ? "" : "s"} on {changedCells} cell{changedCells === 1 ? "" : "s"}
                    </span>{" "}
                    differ from today (highlighted, with today&apos;s value beside them).
                  </>
                )}
              </p>
              {changedCells > 0 && (
                <ul className="asof-differences" data-testid="asof-differences">
                  {then
                    .filter((row) => differences[row.code])
                    .slice(0, MAX_LISTED)
                    .flatMap((row) =>
                      Object.entries(differences[row.code]).map(([parameter, today]) => (
                        <li key={`${row.code}-${parameter}`}>
                          <Link href={`/network/cells/${encodeURIComponent(row.code)}`}>{row.code}</Link>{" "}
                          {PARAMETER_DISPLAY[parameter as CellParameter].label.toLowerCase()}:{" "}
                          <strong>{parameterText(parameter as CellParameter, row[parameter as CellParameter])}</strong> then,{" "}
                          {parameterText(parameter as CellParameter, today as number | string)} today
                        </li>
                      )),
                    )}
                  {changedCells > MAX_LISTED && <li className="muted">and {changedCells - MAX_LISTED} more cells, highlighted in the table</li>}
                </ul>
              )}
              <CellsTable cells={then} differences={differences} />
            </>
          )}
        </section>
      )}

      <section className="panel" aria-labelledby="versions-heading">
        <h2 id="versions-heading" className="panel-title">
          Versions
        </h2>
        <table className="data" data-testid="versions-table">
          <thead>
            <tr>
              <th className="num">Version</th>
              <th>Created (UTC)</th>
              <th>How</th>
              <th>By</th>
              <th>Note</th>
            </tr>
          </thead>
          <tbody>
            {versions.map((v) => (
              <tr key={v.number} className={moment?.kind === "version" && moment.version === v.number ? "selected" : undefined}>
                <td className="num">
                  <Link href={`/network/as-of?version=${v.number}`}>{v.number}</Link>
                </td>
                <td>{utcDateTime(v.createdAt)}</td>
                <td>
                  {v.requestNumber !== null && v.changeRequestId ? (
                    <Link href={`/requests/${v.changeRequestId}`}>
                      {v.kind} · request #{v.requestNumber}
                    </Link>
                  ) : (
                    v.kind
                  )}
                </td>
                <td>{v.createdByName ?? <span className="muted">–</span>}</td>
                <td className="wrap">{v.note}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
    </main>
  );
}
