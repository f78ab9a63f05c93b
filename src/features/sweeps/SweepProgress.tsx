// A sweep that is computing: pairs done of all and the time left at the pace so far, kept current by
// the job polling hook; the page reloads to show the results once the sweep ends.
import { useJobPolling } from "@/features/jobs/useJobPolling";
import type { ApiJobStatus } from "@/features/jobs/jobs";
import { formatDuration } from "./sweeps";

interface Status {
  status: ApiJobStatus;
  done: number;
  total: number;
  timeLeft_s: number | null;
}

export default function SweepProgress(props: { id: number } & Status) {
  const initial = { status: props.status, done: props.done, total: props.total, timeLeft_s: props.timeLeft_s };
  const { state: s, error } = useJobPolling<Status>(`/api/v1/sweeps/${props.id}?fields=status`, initial, {
    first_ms: 500,
    every_ms: 1000,
  });

  const pct = s.total > 0 ? Math.round((100 * s.done) / s.total) : 0;
  return (
    <section className="card" aria-label="Progress" aria-live="polite">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2>{s.status === "queued" ? "Waiting for a worker…" : "Computing the pairs…"}</h2>
        <span className="num text-sm text-ink-soft" data-testid="sweep-progress">
          {s.done} of {s.total} pairs
          {s.timeLeft_s !== null && s.done < s.total ? ` · about ${formatDuration(s.timeLeft_s)} left` : ""}
        </span>
      </div>
      <div
        className="mt-3 h-2.5 overflow-hidden rounded bg-line"
        role="progressbar"
        aria-label="Sweep progress"
        aria-valuemin={0}
        aria-valuemax={s.total}
        aria-valuenow={s.done}
      >
        <div className="h-full bg-accent transition-[width] duration-300" style={{ width: `${Math.max(2, pct)}%` }} />
      </div>
      <p className="help mt-2">
        Each pair is one joint search over the budget's CTLE and transmit FIR grids with a closed-form DFE; this page
        updates by itself.
      </p>
      {error && <p className="notice notice-warn mt-2">{error}</p>}
    </section>
  );
}
