// A queued or running tuning run: its progress bar, kept current by polling the run's status;
// when the run ends the page reloads to show the result (or the reason it failed).
import { useEffect, useState } from "react";
import { api } from "@/components/api";

interface Status {
  status: "queued" | "running" | "done" | "failed";
  progress: number;
}

export default function RunProgress(props: { id: number; status: Status["status"]; progress: number }) {
  const [s, setS] = useState<Status>({ status: props.status, progress: props.progress });
  const [error, setError] = useState<string | null>(null);

  useEffect(() => {
    let stop = false;
    let timer: ReturnType<typeof setTimeout>;
    async function poll() {
      try {
        const r = await api<Status>(`/api/v1/runs/${props.id}?fields=status`);
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
      timer = setTimeout(poll, 400);
    }
    timer = setTimeout(poll, 300);
    return () => {
      stop = true;
      clearTimeout(timer);
    };
  }, [props.id]);

  const pct = Math.round(s.progress * 100);
  return (
    <section className="card" aria-label="Progress">
      <div className="flex items-baseline justify-between">
        <h2>{s.status === "queued" ? "Waiting for a worker…" : s.status === "running" ? "Tuning…" : "Finishing…"}</h2>
        <span className="num text-sm text-ink-soft" data-testid="run-progress">{pct} %</span>
      </div>
      <div className="mt-3 h-2.5 overflow-hidden rounded bg-line" role="progressbar" aria-label="Run progress" aria-valuemin={0} aria-valuemax={100} aria-valuenow={pct}>
        <div className="h-full bg-accent transition-[width] duration-300" style={{ width: `${Math.max(2, pct)}%` }} />
      </div>
      <p className="help mt-2">
        The engine searches the CTLE grid and the transmit FIR with a closed-form DFE in a worker thread; this page updates by itself.
      </p>
      {error && <p className="notice notice-warn mt-2">{error}</p>}
    </section>
  );
}
