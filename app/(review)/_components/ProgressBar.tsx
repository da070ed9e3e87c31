"use client";
// A simulation job's progress: bar, status word and, when it failed or is retrying, the reason.

export type JobStatus = "queued" | "running" | "retrying" | "done" | "failed";

const STATUS: Record<JobStatus, { label: string; tone: "" | "good" | "bad" | "warn" | "info" }> = {
  queued: { label: "Waiting to start", tone: "" },
  running: { label: "Running", tone: "info" },
  retrying: { label: "Retrying", tone: "warn" },
  done: { label: "Finished", tone: "good" },
  failed: { label: "Failed", tone: "bad" },
};

export interface ProgressBarProps {
  /** 0..1; clamped, non-finite reads as 0. */
  fraction: number;
  status: JobStatus;
  error?: string | null;
  /** What is progressing, e.g. "Simulation". */
  label?: string;
}

export function ProgressBar({ fraction, status, error = null, label = "Simulation" }: ProgressBarProps) {
  const clamped = Number.isFinite(fraction) ? Math.min(1, Math.max(0, fraction)) : 0;
  const shown = status === "done" ? 1 : clamped;
  const percent = Math.round(shown * 100);
  const { label: statusLabel, tone } = STATUS[status];
  return (
    <div className="progress-block" data-testid="progress" data-status={status}>
      <div className="progress-head">
        <span>{label}</span>
        <span className={tone ? `badge ${tone}` : "badge"}>{statusLabel}</span>
        <span className="muted">{percent}%</span>
      </div>
      <div
        className={`progress progress-${status}`}
        role="progressbar"
        aria-label={`${label}: ${statusLabel}`}
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={percent}
      >
        <div style={{ width: `${percent}%` }} />
      </div>
      {error && (status === "failed" || status === "retrying") && (
        <p className={status === "failed" ? "field-error" : "muted"} role={status === "failed" ? "alert" : undefined}>
          {error}
        </p>
      )}
    </div>
  );
}
