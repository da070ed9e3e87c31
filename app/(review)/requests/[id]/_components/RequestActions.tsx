"use client";
import { useState } from "react";
import { useRouter } from "next/navigation";
import { ACTION_LABELS, type RequestAction } from "@/lib/changes/rules";
import { callApi, ApiProblem } from "../../_components/api";

const DECISIONS: RequestAction[] = ["approve", "return", "reject"];
const NEEDS_COMMENT: RequestAction[] = ["reject", "return"];
const ORDER: RequestAction[] = ["submit", "withdraw", "rebase", "approve", "return", "reject", "implement", "rollback"];

export interface RequestActionsProps {
  requestId: string;
  version: number;
  actions: RequestAction[];
  canPreview: boolean;
  canEdit: boolean;
  safetyNotice: string;
}

/** The buttons the signed-in user may press now; the server checks the same rules again. */
export function RequestActions({ requestId, version, actions, canPreview, canEdit, safetyNotice }: RequestActionsProps) {
  const router = useRouter();
  const [comment, setComment] = useState("");
  const [busy, setBusy] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  const shown = ORDER.filter((a) => actions.includes(a));
  const decides = shown.some((a) => DECISIONS.includes(a));

  async function run(action: RequestAction | "preview") {
    setError(null);
    if (action !== "preview" && NEEDS_COMMENT.includes(action) && comment.trim() === "") {
      setError(`${ACTION_LABELS[action]} needs a comment saying why.`);
      return;
    }
    setBusy(action);
    try {
      if (action === "preview") await callApi(`/api/requests/${requestId}/preview`, "POST");
      else await callApi(`/api/requests/${requestId}/actions`, "POST", { action, version, ...(comment.trim() ? { comment: comment.trim() } : {}) });
      setComment("");
      router.refresh();
    } catch (e) {
      setError(e instanceof ApiProblem ? e.message : String(e));
    } finally {
      setBusy(null);
    }
  }

  if (shown.length === 0 && !canPreview && !canEdit) {
    return <p className="muted" data-testid="no-actions">Nothing for you to do on this request in its current state.</p>;
  }
  return (
    <div data-testid="request-actions">
      {decides && (
        <div className="caution" role="note">
          <strong>Before you approve:</strong> {safetyNotice}
        </div>
      )}
      {(shown.length > 0) && (
        <>
          <label htmlFor="action-comment">Comment {decides ? "(required to reject or send back)" : "(optional)"}</label>
          <textarea id="action-comment" value={comment} onChange={(e) => setComment(e.target.value)} placeholder="Why — this goes into the record" />
        </>
      )}
      <div className="tools" style={{ marginTop: 8 }}>
        {canEdit && (
          <a className="secondary" href={`/requests/${requestId}/edit`}>
            Edit items
          </a>
        )}
        {canPreview && (
          <button className="secondary" type="button" disabled={busy !== null} onClick={() => run("preview")}>
            {busy === "preview" ? "Starting…" : "Preview impact"}
          </button>
        )}
        {shown.map((action) => (
          <button
            key={action}
            type="button"
            className={action === "reject" || action === "rollback" ? "danger" : action === "approve" || action === "submit" || action === "implement" ? "primary" : "secondary"}
            disabled={busy !== null}
            onClick={() => run(action)}
          >
            {busy === action ? "Working…" : ACTION_LABELS[action]}
          </button>
        ))}
      </div>
      {error && (
        <p className="field-error" role="alert" data-testid="action-error">
          {error}
        </p>
      )}
    </div>
  );
}
