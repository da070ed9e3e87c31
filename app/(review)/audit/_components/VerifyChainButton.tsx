"use client";
// Recomputes the audit hash chain on the server and says whether it holds, and where it first breaks.
import { useState } from "react";

type Verdict =
  | { ok: true; count: number; headSeq: number | null }
  | { ok: false; brokenAt: number; message: string; headSeq: number | null };

type State = { kind: "idle" } | { kind: "checking" } | { kind: "done"; verdict: Verdict; at: string } | { kind: "error"; message: string };

export function VerifyChainButton() {
  const [state, setState] = useState<State>({ kind: "idle" });
  const verify = async () => {
    setState({ kind: "checking" });
    try {
      const response = await fetch("/api/audit/verify", { method: "POST", credentials: "same-origin" });
      const body = await response.json().catch(() => null);
      if (!response.ok) {
        setState({ kind: "error", message: (body as { error?: { message?: string } } | null)?.error?.message ?? `HTTP ${response.status}` });
        return;
      }
      setState({ kind: "done", verdict: body as Verdict, at: new Date().toISOString().slice(11, 19) });
    } catch (error) {
      setState({ kind: "error", message: error instanceof Error ? error.message : String(error) });
    }
  };
  return (
    <div className="verify-chain" data-testid="verify-chain">
      <button type="button" className="secondary" onClick={verify} disabled={state.kind === "checking"}>
        {state.kind === "checking" ? "Verifying…" : "Verify chain now"}
      </button>
      <span aria-live="polite">
        {state.kind === "idle" && <span className="muted">Recomputes every event&apos;s hash from the first one.</span>}
        {state.kind === "done" && state.verdict.ok && (
          <>
            <span className="badge good" data-testid="chain-status">intact</span>{" "}
            <span className="muted">
              {state.verdict.count} events, each linked to the one before · checked {state.at} UTC
            </span>
          </>
        )}
        {state.kind === "done" && !state.verdict.ok && (
          <>
            <span className="badge bad" data-testid="chain-status">broken at event {state.verdict.brokenAt}</span>{" "}
            <span className="worse">{state.verdict.message}</span>
          </>
        )}
        {state.kind === "error" && (
          <span className="field-error" role="alert">
            Could not verify: {state.message}
          </span>
        )}
      </span>
    </div>
  );
}
