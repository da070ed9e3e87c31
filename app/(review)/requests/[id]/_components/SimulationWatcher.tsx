"use client";
import { useEffect, useState } from "react";
import { useRouter } from "next/navigation";
import { ProgressBar } from "../../../_components/ProgressBar";

type Status = "queued" | "running" | "retrying" | "done" | "failed";

/** Polls a running simulation and refreshes the page once it has finished. */
export function SimulationWatcher({ simulationId, initial, label }: { simulationId: string; initial: { status: Status; progress: number }; label: string }) {
  const router = useRouter();
  const [state, setState] = useState<{ status: Status; progress: number; error: string | null }>({ ...initial, error: null });
  useEffect(() => {
    let stopped = false;
    const tick = async () => {
      try {
        const response = await fetch(`/api/simulations/${simulationId}`, { credentials: "same-origin" });
        if (response.ok) {
          const body = (await response.json()) as { status: Status; progress: number; error: string | null };
          if (stopped) return;
          setState(body);
          if (body.status === "done" || body.status === "failed") {
            router.refresh();
            return;
          }
        }
      } catch {
        /* a missed poll is retried */
      }
      if (!stopped) setTimeout(tick, 700);
    };
    const timer = setTimeout(tick, 400);
    return () => {
      stopped = true;
      clearTimeout(timer);
    };
  }, [simulationId, router]);
  return (
    <div data-testid="simulation-progress">
      <ProgressBar fraction={state.progress} status={state.status} error={state.error ?? undefined} label={label} />
    </div>
  );
}
