"use client";
import { useState } from "react";
import { useRouter } from "next/navigation";
import { callApi, ApiProblem } from "../../_components/api";

export function CommentForm({ requestId }: { requestId: string }) {
  const router = useRouter();
  const [text, setText] = useState("");
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  async function submit(event: React.FormEvent) {
    event.preventDefault();
    setBusy(true);
    setError(null);
    try {
      await callApi(`/api/requests/${requestId}/comments`, "POST", { text });
      setText("");
      router.refresh();
    } catch (e) {
      setError(e instanceof ApiProblem ? e.details.map((d) => d.message).join("; ") || e.message : String(e));
    } finally {
      setBusy(false);
    }
  }
  return (
    <form onSubmit={submit}>
      <label htmlFor="comment-text">Add a comment</label>
      <textarea id="comment-text" value={text} onChange={(e) => setText(e.target.value)} />
      {error && <p className="field-error">{error}</p>}
      <button className="secondary" type="submit" disabled={busy || text.trim() === ""}>
        {busy ? "Posting…" : "Post comment"}
      </button>
    </form>
  );
}
