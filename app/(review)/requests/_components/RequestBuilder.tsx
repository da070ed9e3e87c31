"use client";
import { Suspense, useMemo, useState } from "react";
import { useRouter } from "next/navigation";
import type { CellParameter } from "@/lib/radio/scenario";
import type { AntennaModelDto, BeamSetDto, CellRow } from "@/lib/db/networks/data";
import { mapSitesOf } from "../../_components/mapSites";
import { callApi, ApiProblem, problemsAt, type FieldProblem } from "./api";
import { BuilderMap, type BuilderMapInfo } from "./BuilderMap";

export interface BuilderItem {
  cellId: string;
  parameter: CellParameter;
  newValue: number | string;
}

export interface RequestBuilderProps {
  cells: CellRow[];
  antennaModels: AntennaModelDto[];
  beamSets: BeamSetDto[];
  initial: { title: string; reason: string; windowStart: string | null; windowEnd: string | null; items: BuilderItem[] };
  /** Editing an existing draft: its id and optimistic version. */
  editing?: { requestId: string; version: number };
  /** The map to choose cells on (the network as it stands); without it, the table only. */
  map?: Promise<BuilderMapInfo | null>;
}

/** Height of the map and of the cells table beside it, CSS pixels. */
const CELLS_HEIGHT_PX = 440;

const NUMERIC: { parameter: Exclude<CellParameter, "beamSetId">; label: string; unit: string; step: number }[] = [
  { parameter: "azimuthDeg", label: "Azimuth", unit: "°", step: 0.1 },
  { parameter: "mechanicalTiltDeg", label: "Mechanical tilt", unit: "°", step: 0.5 },
  { parameter: "electricalTiltDeg", label: "Electrical tilt", unit: "°", step: 0.5 },
  { parameter: "rsPowerDbm", label: "RS power", unit: "dBm", step: 0.1 },
];

function rangeOf(model: AntennaModelDto | undefined, parameter: CellParameter): [number, number] | null {
  if (parameter === "azimuthDeg") return [0, 359.9];
  if (!model) return null;
  if (parameter === "mechanicalTiltDeg") return [model.mechanicalTiltMinDeg, model.mechanicalTiltMaxDeg];
  if (parameter === "electricalTiltDeg") return [model.electricalTiltMinDeg, model.electricalTiltMaxDeg];
  if (parameter === "rsPowerDbm") return [model.rsPowerMinDbm, model.rsPowerMaxDbm];
  return null;
}

/** ISO → the value of a datetime-local input (UTC, since the app shows UTC everywhere). */
function toLocalInput(iso: string | null): string {
  return iso ? iso.slice(0, 16) : "";
}

type Draft = Record<string, Partial<Record<CellParameter, string>>>;

export function RequestBuilder({ cells, antennaModels, beamSets, initial, editing, map }: RequestBuilderProps) {
  const router = useRouter();
  const models = useMemo(() => new Map(antennaModels.map((m) => [m.code, m])), [antennaModels]);
  const byCode = useMemo(() => new Map(cells.map((c) => [c.code, c])), [cells]);
  const [title, setTitle] = useState(initial.title);
  const [reason, setReason] = useState(initial.reason);
  const [windowStart, setWindowStart] = useState(toLocalInput(initial.windowStart));
  const [windowEnd, setWindowEnd] = useState(toLocalInput(initial.windowEnd));
  const [selected, setSelected] = useState<string[]>(() => [...new Set(initial.items.map((i) => i.cellId))]);
  const [draft, setDraft] = useState<Draft>(() => {
    const out: Draft = {};
    for (const item of initial.items) (out[item.cellId] ??= {})[item.parameter] = String(item.newValue);
    return out;
  });
  const [filter, setFilter] = useState("");
  const [problems, setProblems] = useState<FieldProblem[]>([]);
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  // the map marks the chosen cells; wedges point where the cells point now, like the coverage drawn under them
  const mapSites = useMemo(() => mapSitesOf(cells, [], new Set(selected)), [cells, selected]);

  const visible = cells.filter((c) => !filter || `${c.code} ${c.siteName} ${c.beamSetId}`.toLowerCase().includes(filter.toLowerCase()));

  function toggle(code: string) {
    setSelected((now) => (now.includes(code) ? now.filter((c) => c !== code) : [...now, code]));
  }

  function setValue(code: string, parameter: CellParameter, value: string) {
    setDraft((now) => ({ ...now, [code]: { ...now[code], [parameter]: value } }));
  }

  /** Items: every selected cell's parameters that differ from the cell's current value. */
  function items(): BuilderItem[] {
    const out: BuilderItem[] = [];
    for (const code of selected) {
      const cell = byCode.get(code);
      const values = draft[code] ?? {};
      if (!cell) continue;
      for (const { parameter } of NUMERIC) {
        const text = values[parameter];
        if (text === undefined || text.trim() === "") continue;
        const value = Number(text);
        if (Number.isFinite(value) && value === cell[parameter]) continue;
        // Non-numbers go to the server as typed, so that its message names the field.
        out.push({ cellId: code, parameter, newValue: Number.isFinite(value) ? value : text });
      }
      const beamSet = values.beamSetId;
      if (beamSet !== undefined && beamSet !== cell.beamSetId) out.push({ cellId: code, parameter: "beamSetId", newValue: beamSet });
    }
    return out;
  }

  async function save(event: React.FormEvent) {
    event.preventDefault();
    setBusy(true);
    setProblems([]);
    setMessage(null);
    const list = items();
    const body = {
      title,
      reason,
      items: list,
      ...(windowStart ? { windowStart: `${windowStart}:00Z` } : {}),
      ...(windowEnd ? { windowEnd: `${windowEnd}:00Z` } : {}),
    };
    try {
      const result = editing
        ? await callApi<{ id: string }>(`/api/requests/${editing.requestId}`, "PATCH", {
            ...body,
            version: editing.version,
            ...(windowStart || windowEnd ? {} : { windowStart: null, windowEnd: null }),
          })
        : await callApi<{ id: string }>("/api/requests", "POST", body);
      router.push(`/requests/${result.id}`);
      router.refresh();
    } catch (e) {
      if (e instanceof ApiProblem) {
        // Item errors name "items[i]…": show them beside the cell and parameter they belong to.
        setProblems(
          e.details.map((d) => {
            const match = /^items\[(\d+)\](.*)$/.exec(d.path);
            const item = match ? list[Number(match[1])] : undefined;
            return item ? { path: `${item.cellId}.${item.parameter}`, message: d.message } : d;
          }),
        );
        setMessage(e.message);
      } else setMessage(String(e));
    } finally {
      setBusy(false);
    }
  }

  const changeCount = items().length;
  // Problems shown beside their field; the rest are listed under the form.
  const shownPaths = new Set<string>(["title", "reason", "windowStart", "windowEnd"]);
  for (const code of selected) for (const parameter of [...NUMERIC.map((n) => n.parameter), "beamSetId"]) shownPaths.add(`${code}.${parameter}`);

  return (
    <form onSubmit={save} aria-label="Change request" data-testid="request-builder">
      <div className="panel builder-details">
        <div className="builder-details-row">
          <div className="builder-title">
            <label htmlFor="cr-title">Title</label>
            <input id="cr-title" value={title} onChange={(e) => setTitle(e.target.value)} />
            {problemsAt(problems, "title").map((m) => (
              <p key={m} className="field-error">{m}</p>
            ))}
          </div>
          <div>
            <label htmlFor="cr-window-start">Change window from (UTC)</label>
            <input id="cr-window-start" type="datetime-local" value={windowStart} onChange={(e) => setWindowStart(e.target.value)} />
          </div>
          <div>
            <label htmlFor="cr-window-end">until (UTC)</label>
            <input id="cr-window-end" type="datetime-local" value={windowEnd} onChange={(e) => setWindowEnd(e.target.value)} />
          </div>
        </div>
        {problemsAt(problems, "windowStart")
          .concat(problemsAt(problems, "windowEnd"))
          .map((m) => (
            <p key={m} className="field-error">{m}</p>
          ))}
        <label htmlFor="cr-reason">Reason</label>
        <textarea id="cr-reason" value={reason} onChange={(e) => setReason(e.target.value)} placeholder="What problem this change solves, and what you expect" />
        {problemsAt(problems, "reason").map((m) => (
          <p key={m} className="field-error">{m}</p>
        ))}
      </div>

      <div className="panel">
        <div className="page-head">
          <h3 style={{ margin: 0 }}>Cells</h3>
          <span className="muted" data-testid="chosen-count">
            {selected.length === 0
              ? "none chosen yet"
              : `${selected.length} chosen: ${selected.slice(0, 10).join(", ")}${selected.length > 10 ? ` and ${selected.length - 10} more` : ""}`}
          </span>
        </div>
        <p className="muted panel-note">
          {map
            ? "Click a cell’s wedge on the map, or tick it in the table; click it again to take it out. A click on a site’s dot lists its cells. Chosen cells are drawn in teal with their names."
            : "Tick the cells to change."}
        </p>
        <div className={map ? "builder-cells" : undefined}>
          {map && (
            <div className="builder-map">
              <Suspense fallback={<div className="gridmap-stage" style={{ height: CELLS_HEIGHT_PX }} aria-busy="true" />}>
                <BuilderMap info={map} sites={mapSites} onPickCell={toggle} height={CELLS_HEIGHT_PX} />
              </Suspense>
            </div>
          )}
          <div>
            <div className="tools">
              <input
                placeholder="Filter by cell, site or beam set…"
                value={filter}
                onChange={(e) => setFilter(e.target.value)}
                aria-label="Filter cells"
                style={{ width: "100%" }}
              />
            </div>
            <div style={{ maxHeight: map ? CELLS_HEIGHT_PX - 4 : 260, overflowY: "auto" }}>
              <table className="data" data-testid="builder-cells">
                <thead>
                  <tr>
                    <th />
                    <th>Cell</th>
                    <th>Site</th>
                    <th className="num">Az °</th>
                    <th className="num">E-tilt °</th>
                    <th>Beam set</th>
                  </tr>
                </thead>
                <tbody>
                  {visible.map((cell) => (
                    <tr key={cell.code} className={selected.includes(cell.code) ? "selected" : undefined}>
                      <td>
                        <input type="checkbox" aria-label={`Choose ${cell.code}`} checked={selected.includes(cell.code)} onChange={() => toggle(cell.code)} />
                      </td>
                      <td>{cell.code}</td>
                      <td>{cell.siteName}</td>
                      <td className="num">{cell.azimuthDeg}</td>
                      <td className="num">{cell.electricalTiltDeg}</td>
                      <td>{cell.beamSetId}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          </div>
        </div>
      </div>

      {selected.length > 0 && (
        <div className="panel">
          <h3 style={{ marginTop: 0 }}>New values</h3>
          <p className="muted">Leave a value as it is to keep it; the allowed range of each cell&apos;s antenna is shown under each field.</p>
          <table className="data builder-values">
            <thead>
              <tr>
                <th>Cell</th>
                {NUMERIC.map((n) => (
                  <th key={n.parameter}>
                    {n.label} ({n.unit})
                  </th>
                ))}
                <th>Beam set</th>
              </tr>
            </thead>
            <tbody>
              {selected.map((code) => {
                const cell = byCode.get(code);
                if (!cell) return null;
                const model = models.get(cell.antennaModel);
                const values = draft[code] ?? {};
                return (
                  <tr key={code}>
                    <td>
                      <strong>{code}</strong>
                      <div className="muted">{cell.antennaModel}</div>
                    </td>
                    {NUMERIC.map((n) => {
                      const range = rangeOf(model, n.parameter);
                      const errors = problemsAt(problems, `${code}.${n.parameter}`);
                      return (
                        <td key={n.parameter}>
                          <input
                            aria-label={`${code} ${n.label}`}
                            inputMode="decimal"
                            style={{ width: 90 }}
                            value={values[n.parameter] ?? String(cell[n.parameter])}
                            onChange={(e) => setValue(code, n.parameter, e.target.value)}
                          />
                          <div className="muted" style={{ fontSize: 11 }}>
                            now {cell[n.parameter]}
                            {range ? ` · ${range[0]}…${range[1]}` : ""}
                          </div>
                          {errors.map((m) => (
                            <div key={m} className="field-error">{m}</div>
                          ))}
                        </td>
                      );
                    })}
                    <td>
                      <select aria-label={`${code} beam set`} value={values.beamSetId ?? cell.beamSetId} onChange={(e) => setValue(code, "beamSetId", e.target.value)}>
                        {(model?.beamSetCodes ?? [cell.beamSetId]).map((codeOfSet) => (
                          <option key={codeOfSet} value={codeOfSet}>
                            {beamSets.find((b) => b.code === codeOfSet)?.name ?? codeOfSet}
                          </option>
                        ))}
                      </select>
                      {problemsAt(problems, `${code}.beamSetId`).map((m) => (
                        <div key={m} className="field-error">{m}</div>
                      ))}
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      )}

      {message && (
        <div className="banner bad" role="alert" data-testid="builder-error">
          {message}
          {problems.filter((p) => !shownPaths.has(p.path)).map((p) => (
            <div key={p.path + p.message}>
              {p.path}: {p.message}
            </div>
          ))}
        </div>
      )}
      <div className="tools">
        <button className="primary" type="submit" disabled={busy}>
          {busy ? "Saving…" : editing ? "Save changes" : "Save as draft"}
        </button>
        <span className="muted">
          {changeCount} parameter change{changeCount === 1 ? "" : "s"}. Saving makes a draft; preview its impact and submit it from its page.
        </span>
      </div>
    </form>
  );
}
