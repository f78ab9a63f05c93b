// A sweep that is computing: pairs done of all and the time left at the pace so far, kept current by
// polling its status; the page reloads to show the results once the sweep ends.
import { useEffect, useState } from "react";
import { api } from "@/components/api";
import { formatDuration } from "./sweeps";

interface Status {
  status: "queued" | "running" | "done" | "failed";
  done: number;
  total: number;
  timeLeft_s: number | null;
}

export default function SweepProgress(props: { id: number } & Status) {
  const [s, setS] = useState<Status>({ status: props.status, done: props.done, total: props.total, timeLeft_s: props.timeLeft_s });
  const [error, setError] = useState<string | null>(null);

  useEffect(() => {
    let stop = false;
    let timer: ReturnType<typeof setTimeout>;
    async function poll() {
      try {
        const r = await api<Status>(`/api/v1/sweeps/${props.id}?fields=status`);
        if (stop) return;
        setS(r);
        setError(null);
        if (r.status === "done" || r.status === "failed") {
          location.reload();
          return;
        }
      } catch (e) {
        setError((e as Error).message);
      }
      timer = setTimeout(poll, 1000);
    }
    timer = setTimeout(poll, 500);
    return () => {
      stop = true;
      clearTimeout(timer);
    };
  }, [props.id]);

  const pct = s.total > 0 ? Math.round((100 * s.done) / s.total) : 0;
  return (
    <section className="card" aria-label="Progress" aria-live="polite">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2>{s.status === "queued" ? "Waiting for a worker…" : "Computing the pairs…"}</h2>
        <span className="num text-sm text-ink-soft" data-testid="sweep-progress">
          {s.done} of {s.total} pairs{s.timeLeft_s !== null && s.done < s.total ? ` · about ${formatDuration(s.timeLeft_s)} left` : ""}
        </span>
      </div>
      <div className="mt-3 h-2.5 overflow-hidden rounded bg-line" role="progressbar" aria-label="Sweep progress" aria-valuemin={0} aria-valuemax={s.total} aria-valuenow={s.done}>
        <div className="h-full bg-accent transition-[width] duration-300" style={{ width: `${Math.max(2, pct)}%` }} />
      </div>
      <p className="help mt-2">Each pair is one joint search over the budget's CTLE and transmit FIR grids with a closed-form DFE; this page updates by itself.</p>
      {error && <p className="notice notice-warn mt-2">{error}</p>}
    </section>
  );
}
