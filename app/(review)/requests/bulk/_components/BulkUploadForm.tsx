"use client";
// Upload of a bulk change CSV: one file plus title and reason become one draft change request.
// Problems come back as a table naming file, row and column.
import { useState } from "react";
import { useRouter } from "next/navigation";
import { UploadReport, type UploadProblem } from "@/app/(review)/admin/import/_components/UploadReport";

export function BulkUploadForm({ networks }: { networks: { id: string; name: string; latestVersion: number }[] }) {
  const router = useRouter();
  const [file, setFile] = useState<File | null>(null);
  const [title, setTitle] = useState("");
  const [reason, setReason] = useState("");
  const [network, setNetwork] = useState(networks[0]?.id ?? "");
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<string | null>(null);
  const [report, setReport] = useState<{ errors: UploadProblem[]; warnings: UploadProblem[] } | null>(null);

  async function submit(event: React.FormEvent) {
    event.preventDefault();
    if (!file) return;
    setBusy(true);
    setMessage(null);
    setReport(null);
    const form = new FormData();
    form.append("file", file, file.name);
    form.append("title", title);
    form.append("reason", reason);
    if (network) form.append("network", network);
    try {
      const response = await fetch("/api/requests/bulk", { method: "POST", body: form, credentials: "same-origin" });
      const body = (await response.json().catch(() => ({}))) as {
        id?: string;
        report?: { errors: UploadProblem[]; warnings: UploadProblem[] };
        error?: { message: string };
      };
      if (response.status === 201 && body.id) {
        router.push(`/requests/${body.id}`);
        return;
      }
      setReport(body.report ?? null);
      setMessage(response.status === 422 ? "Nothing was created: fix the rows below and upload again." : (body.error?.message ?? `The server answered HTTP ${response.status}.`));
    } catch (e) {
      setMessage(`The upload failed: ${e instanceof Error ? e.message : String(e)}`);
    } finally {
      setBusy(false);
    }
  }

  return (
    <form className="panel" onSubmit={submit}>
      {networks.length > 1 && (
        <>
          <label htmlFor="bulk-network">Network</label>
          <select id="bulk-network" value={network} onChange={(e) => setNetwork(e.target.value)}>
            {networks.map((n) => (
              <option key={n.id} value={n.id}>
                {n.name} (version {n.latestVersion})
              </option>
            ))}
          </select>
        </>
      )}
      <label htmlFor="bulk-file">Changes (CSV)</label>
      <input id="bulk-file" type="file" accept=".csv,text/csv" onChange={(e) => setFile(e.target.files?.[0] ?? null)} />
      <label htmlFor="bulk-title">Title</label>
      <input id="bulk-title" type="text" value={title} onChange={(e) => setTitle(e.target.value)} style={{ width: "100%" }} />
      <label htmlFor="bulk-reason">Reason</label>
      <textarea id="bulk-reason" value={reason} onChange={(e) => setReason(e.target.value)} />
      <div className="tools" style={{ marginTop: 12 }}>
        <button className="primary" type="submit" disabled={!file || busy || title.trim() === "" || reason.trim() === ""}>
          {busy ? "Uploading…" : "Create draft request"}
        </button>
      </div>
      {message && (
        <div className="banner bad" role="alert" data-testid="bulk-outcome">
          {message}
        </div>
      )}
      {report && <UploadReport errors={report.errors} warnings={report.warnings} />}
    </form>
  );
}
