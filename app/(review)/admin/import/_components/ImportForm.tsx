"use client";
// Upload form of the network import: "Check" validates only (?dryRun=1), "Import" writes the
// network when there is no error. Both show the server's report.
import { useState } from "react";
import { useRouter } from "next/navigation";
import { UploadReport, type UploadProblem } from "./UploadReport";

interface Outcome {
  status: number;
  message: string;
  tone: "good" | "bad" | "info";
  errors: UploadProblem[];
  warnings: UploadProblem[];
}

export function ImportForm({ maxMb }: { maxMb: number }) {
  const router = useRouter();
  const [files, setFiles] = useState<File[]>([]);
  const [name, setName] = useState("");
  const [busy, setBusy] = useState<"check" | "import" | null>(null);
  const [outcome, setOutcome] = useState<Outcome | null>(null);

  async function send(mode: "check" | "import") {
    setBusy(mode);
    setOutcome(null);
    const form = new FormData();
    for (const f of files) form.append("files", f, f.name);
    if (name.trim()) form.append("name", name.trim());
    try {
      const response = await fetch(`/api/import${mode === "check" ? "?dryRun=1" : ""}`, { method: "POST", body: form, credentials: "same-origin" });
      const body = (await response.json().catch(() => ({}))) as {
        report?: { errors: UploadProblem[]; warnings: UploadProblem[] };
        networkId?: string;
        name?: string;
        counts?: { sites: number; cells: number; buildings: number; clusters: number };
        error?: { message: string };
      };
      const errors = body.report?.errors ?? [];
      const warnings = body.report?.warnings ?? [];
      let message: string;
      let tone: Outcome["tone"] = "bad";
      if (response.status === 201 && body.counts) {
        const c = body.counts;
        message = `Imported “${body.name}”: ${c.sites} sites, ${c.cells} cells, ${c.buildings} buildings, ${c.clusters} clusters (network ${body.networkId}).`;
        tone = "good";
        router.refresh();
      } else if (response.ok) {
        message = `No errors: “${body.name}” can be imported.`;
        tone = "info";
      } else if (response.status === 422) {
        message = `${errors.length} error${errors.length === 1 ? "" : "s"}: nothing was imported. Fix the files and check again.`;
      } else {
        message = body.error?.message ?? `The server answered HTTP ${response.status}.`;
      }
      setOutcome({ status: response.status, message, tone, errors, warnings });
    } catch (e) {
      setOutcome({ status: 0, message: `The upload failed: ${e instanceof Error ? e.message : String(e)}`, tone: "bad", errors: [], warnings: [] });
    } finally {
      setBusy(null);
    }
  }

  return (
    <div className="panel">
      <form onSubmit={(e) => e.preventDefault()}>
        <label htmlFor="import-files">Files (sites.csv and cells.csv or one .xlsx, buildings and clusters GeoJSON, terrain .tif or .asc, or a .zip)</label>
        <input
          id="import-files"
          type="file"
          multiple
          accept=".csv,.xlsx,.geojson,.json,.tif,.tiff,.asc,.zip"
          onChange={(e) => {
            setFiles(Array.from(e.target.files ?? []));
            setOutcome(null);
          }}
        />
        <p className="field-hint muted">
          {files.length === 0 ? "No file chosen." : `${files.length} file${files.length === 1 ? "" : "s"}: ${files.map((f) => f.name).join(", ")}.`} At most {maxMb} MB in all.
        </p>
        <label htmlFor="import-name">Network name</label>
        <input id="import-name" type="text" value={name} placeholder="Imported network" onChange={(e) => setName(e.target.value)} />
        <div className="tools" style={{ marginTop: 12 }}>
          <button type="button" className="secondary" disabled={files.length === 0 || busy !== null} onClick={() => send("check")}>
            {busy === "check" ? "Checking…" : "Check"}
          </button>
          <button type="button" className="primary" disabled={files.length === 0 || busy !== null} onClick={() => send("import")}>
            {busy === "import" ? "Importing…" : "Import"}
          </button>
        </div>
      </form>
      {outcome && (
        <>
          <div className={`banner ${outcome.tone === "bad" ? "bad" : "info"}`} role={outcome.tone === "bad" ? "alert" : "status"} data-testid="import-outcome">
            {outcome.message}
          </div>
          {(outcome.errors.length > 0 || outcome.warnings.length > 0 || outcome.status === 200 || outcome.status === 201) && (
            <UploadReport errors={outcome.errors} warnings={outcome.warnings} />
          )}
        </>
      )}
    </div>
  );
}
