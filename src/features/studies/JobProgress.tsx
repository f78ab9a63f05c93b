// Progress of a queued or running job (a study or a tap table version): polls its API address
// every second and reloads the page once the job is done or failed, so the result renders server-side.
import { useEffect, useState } from "react";
import { api } from "@/components/api";

interface Props {
  /** The address answering `{ status, progress }` (or `{ job: { status, progress } }`). */
  url: string;
  status: string;
  progress: number;
  what: string;
}

interface Status {
  status: string;
  progress: number;
}

export default function JobProgress(props: Props) {
  const [state, setState] = useState<Status>({ status: props.status, progress: props.progress });
  const [error, setError] = useState<string | null>(null);

  useEffect(() => {
    let stop = false;
    const tick = async () => {
      try {
        const r = await api<Status & { job?: Status }>(props.url);
        const s = r.job ?? r;
        if (stop) return;
        setState({ status: s.status, progress: s.progress });
        if (s.status === "done" || s.status === "failed") {
          location.reload();
          return;
        }
        setError(null);
      } catch (e) {
        setError((e as Error).message);
      }
      if (!stop) setTimeout(tick, 1000);
    };
    const t = setTimeout(tick, 600);
    return () => {
      stop = true;
      clearTimeout(t);
    };
  }, [props.url]);

  const pct = Math.round(state.progress * 100);
  return (
    <div className="card" aria-live="polite" data-testid="job-progress">
      <div className="flex items-baseline justify-between text-sm">
        <span className="font-medium">{state.status === "queued" ? `${props.what} is queued…` : `Computing ${props.what.toLowerCase()}…`}</span>
        <span className="num text-muted">{pct} %</span>
      </div>
      <div className="mt-2 h-2 overflow-hidden rounded-full bg-paper" role="progressbar" aria-valuemin={0} aria-valuemax={100} aria-valuenow={pct} aria-label={`${props.what} progress`}>
        <div className="h-full rounded-full bg-accent transition-[width] duration-500" style={{ width: `${Math.max(2, pct)}%` }} />
      </div>
      {error && <p className="help mt-2">Could not read the progress ({error}); retrying.</p>}
    </div>
  );
}
