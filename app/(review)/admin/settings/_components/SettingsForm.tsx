"use client";
// The KPI thresholds and model options of one network. Sends only the fields that changed
// (PUT /api/admin/settings); a refused value is shown beside its field and what was typed stays.
import { useState } from "react";
import type { ModelSettings } from "@/lib/radio/scenario";
import { sendJson, type ApiFailure } from "../../_components/api";

type Key = keyof ModelSettings;

interface NumberField {
  key: Key;
  kind: "number";
  label: string;
  unit: string;
  step: number;
  help: string;
}
interface ChoiceField {
  key: Key;
  kind: "choice";
  label: string;
  options: { value: string; label: string }[];
  help: string;
}
interface ToggleField {
  key: Key;
  kind: "toggle";
  label: string;
  help: string;
}
type Field = NumberField | ChoiceField | ToggleField;

const GROUPS: { title: string; note?: string; fields: Field[] }[] = [
  {
    title: "KPI thresholds",
    note: "Thresholds are inclusive (≥, ≤).",
    fields: [
      { key: "coverageThresholdDbm", kind: "number", label: "Coverage threshold", unit: "dBm", step: 0.5, help: "A grid is covered when its best-server RSRP is at least this." },
      { key: "overlapDeltaDb", kind: "number", label: "Overlap window Δ", unit: "dB", step: 0.5, help: "Other cells within this many dB of the best server count towards overlap." },
      { key: "overlapMaxOthers", kind: "number", label: "Overlap: most other cells N", unit: "cells", step: 1, help: "A grid passes overlap when at most N other cells arrive within the window." },
      { key: "overlapFloorDbm", kind: "number", label: "Overlap floor", unit: "dBm", step: 0.5, help: "Cells below this RSRP are ignored by the overlap test." },
      { key: "interferenceThresholdDb", kind: "number", label: "Interference threshold", unit: "dB", step: 0.5, help: "A grid passes when its SINR (noise of one subcarrier) is at least this." },
      { key: "worstGridDropDb", kind: "number", label: "Worst-grid RSRP drop", unit: "dB", step: 0.5, help: "A grid losing more than this much best RSRP is listed among the worst grids." },
    ],
  },
  {
    title: "Coverage model",
    fields: [
      {
        key: "environment",
        kind: "choice",
        label: "Path-loss environment",
        options: [
          { value: "UMa", label: "Urban macro (UMa)" },
          { value: "UMi", label: "Urban micro (UMi)" },
        ],
        help: "Scenario of 3GPP TR 38.901 Table 7.4.1-1.",
      },
      {
        key: "buildingLoss",
        kind: "choice",
        label: "Building entry loss",
        options: [
          { value: "low", label: "Low-loss walls" },
          { value: "high", label: "High-loss walls" },
        ],
        help: "O2I model of 3GPP TR 38.901 §7.4.3 for indoor grids.",
      },
      { key: "diffraction", kind: "toggle", label: "Over-roof diffraction", help: "Adds knife-edge diffraction (ITU-R P.526) on obstructed paths; slower." },
      { key: "otherLossesDb", kind: "number", label: "Other losses", unit: "dB", step: 0.5, help: "Fixed body, cable and other losses subtracted from every path." },
      { key: "noiseFigureDb", kind: "number", label: "Receiver noise figure", unit: "dB", step: 0.5, help: "Added to the thermal noise of one subcarrier in the SINR." },
    ],
  },
  {
    title: "Grid",
    note: "Changing the grid rebuilds the model of the network on the next map or simulation.",
    fields: [
      { key: "gridSizeM", kind: "number", label: "Grid size", unit: "m", step: 1, help: "Side of a square grid." },
      { key: "userHeightM", kind: "number", label: "User height", unit: "m", step: 0.1, help: "Height of the outdoor layer and of the first floor above its ground." },
      { key: "floorHeightM", kind: "number", label: "Floor spacing", unit: "m", step: 0.1, help: "Height between two indoor floors." },
    ],
  },
];

type Draft = Record<Key, string | boolean>;

const toDraft = (s: ModelSettings): Draft =>
  Object.fromEntries(Object.entries(s).map(([k, v]) => [k, typeof v === "boolean" ? v : String(v)])) as Draft;

function display(field: Field, value: ModelSettings[Key]): string {
  if (field.kind === "toggle") return value ? "on" : "off";
  if (field.kind === "choice") return field.options.find((o) => o.value === value)?.label ?? String(value);
  return `${value} ${field.unit}`;
}

/** The value to send: a number where the text reads as one, otherwise the text (the server names the problem). */
function parsed(field: Field, value: string | boolean): unknown {
  if (field.kind !== "number") return value;
  const text = String(value).trim();
  const n = Number(text);
  return text !== "" && Number.isFinite(n) ? n : text;
}

export function SettingsForm({ networkId, settings: initial, defaults }: { networkId: string; settings: ModelSettings; defaults: ModelSettings }) {
  const [saved, setSaved] = useState(initial);
  const [draft, setDraft] = useState<Draft>(() => toDraft(initial));
  const [busy, setBusy] = useState(false);
  const [failure, setFailure] = useState<ApiFailure | null>(null);
  const [notice, setNotice] = useState<string | null>(null);

  const fields = GROUPS.flatMap((g) => g.fields);
  const changes = Object.fromEntries(
    fields.map((f) => [f.key, parsed(f, draft[f.key])] as const).filter(([key, value]) => value !== saved[key]),
  );
  const changedCount = Object.keys(changes).length;
  const set = (key: Key, value: string | boolean) => {
    setDraft((d) => ({ ...d, [key]: value }));
    setNotice(null);
  };
  const generalError = failure && !fields.some((f) => failure.fields[f.key]) ? failure.message : null;

  return (
    <form
      className="settings-form"
      data-testid="settings-form"
      onSubmit={async (e) => {
        e.preventDefault();
        if (changedCount === 0) return setNotice("Nothing to save: every field has its stored value.");
        setBusy(true);
        setFailure(null);
        setNotice(null);
        const result = await sendJson<{ settings: ModelSettings }>("PUT", `/api/admin/settings?network=${encodeURIComponent(networkId)}`, changes);
        setBusy(false);
        if (!result.ok) return setFailure(result.failure);
        setSaved(result.data.settings);
        setDraft(toDraft(result.data.settings));
        setNotice(`Saved ${changedCount} setting${changedCount === 1 ? "" : "s"}.`);
      }}
    >
      {GROUPS.map((group) => (
        <fieldset key={group.title} className="panel settings-group">
          <legend>{group.title}</legend>
          {group.note && <p className="muted panel-note">{group.note}</p>}
          {group.fields.map((field) => {
            const id = `setting-${field.key}`;
            const error = failure?.fields[field.key];
            const value = draft[field.key];
            const isDefault = parsed(field, value) === defaults[field.key];
            const changed = parsed(field, value) !== saved[field.key];
            return (
              <div key={field.key} className={`setting-row${changed ? " setting-changed" : ""}`} data-testid={id}>
                <div className="setting-label">
                  <label htmlFor={id}>{field.label}</label>
                  <div className="muted setting-help">{field.help}</div>
                </div>
                <div className="setting-input">
                  <div className="inline-field">
                    {field.kind === "number" && (
                      <>
                        <input
                          id={id}
                          inputMode="decimal"
                          value={String(value)}
                          onChange={(e) => set(field.key, e.target.value)}
                          aria-invalid={error ? true : undefined}
                          aria-describedby={error ? `${id}-error` : `${id}-default`}
                          size={8}
                        />
                        <span className="setting-unit">{field.unit}</span>
                      </>
                    )}
                    {field.kind === "choice" && (
                      <select id={id} value={String(value)} onChange={(e) => set(field.key, e.target.value)} aria-invalid={error ? true : undefined}>
                        {field.options.map((o) => (
                          <option key={o.value} value={o.value}>
                            {o.label}
                          </option>
                        ))}
                      </select>
                    )}
                    {field.kind === "toggle" && (
                      <input id={id} type="checkbox" checked={Boolean(value)} onChange={(e) => set(field.key, e.target.checked)} aria-invalid={error ? true : undefined} />
                    )}
                  </div>
                  {error && (
                    <div className="field-error" id={`${id}-error`} role="alert">
                      {error}
                    </div>
                  )}
                </div>
                <div className="setting-default" id={`${id}-default`}>
                  <span className="muted">default {display(field, defaults[field.key])}</span>
                  {!isDefault && (
                    <button type="button" className="link" onClick={() => set(field.key, typeof defaults[field.key] === "boolean" ? (defaults[field.key] as boolean) : String(defaults[field.key]))}>
                      use default
                    </button>
                  )}
                </div>
              </div>
            );
          })}
        </fieldset>
      ))}
      <div className="settings-actions">
        <button type="submit" className="primary" disabled={busy}>
          {busy ? "Saving…" : changedCount > 0 ? `Save ${changedCount} change${changedCount === 1 ? "" : "s"}` : "Save"}
        </button>
        {changedCount > 0 && (
          <button
            type="button"
            className="secondary"
            onClick={() => {
              setDraft(toDraft(saved));
              setFailure(null);
            }}
          >
            Discard changes
          </button>
        )}
        {notice && (
          <span className="better" role="status">
            {notice}
          </span>
        )}
        {generalError && (
          <span className="field-error" role="alert">
            {generalError}
          </span>
        )}
      </div>
    </form>
  );
}
