// Keeping a queued or running job's status current: polls its address until the job ends, then
// reloads the page so that the result (or the reason it failed) renders server-side.
import { useEffect, useState } from "react";
import { api } from "@/components/api";
import { isJobFinished, type JobStatus } from "./jobs";

export interface JobProgressState {
  status: JobStatus;
  progress: number;
}

/** How often to ask: the first time after `first_ms`, then every `every_ms`. */
export interface PollTiming {
  first_ms: number;
  every_ms: number;
}

/**
 * The job's latest status and progress (from `url`, answering `{ status, progress }` or
 * `{ job: { status, progress } }`), and the last error reading it (null once a read succeeds).
 */
export function useJobPolling(url: string, initial: JobProgressState, timing: PollTiming): { state: JobProgressState; error: string | null } {
  const [state, setState] = useState<JobProgressState>(initial);
  const [error, setError] = useState<string | null>(null);
  const { first_ms, every_ms } = timing;

  useEffect(() => {
    let stop = false;
    let timer: ReturnType<typeof setTimeout>;
    async function poll() {
      try {
        const r = await api<JobProgressState & { job?: JobProgressState }>(url);
        const s = r.job ?? r;
        if (stop) return;
        setState({ status: s.status, progress: s.progress });
        setError(null);
        if (isJobFinished(s.status)) {
          location.reload();
          return;
        }
      } catch (e) {
        setError((e as Error).message);
      }
      if (!stop) timer = setTimeout(poll, every_ms);
    }
    timer = setTimeout(poll, first_ms);
    return () => {
      stop = true;
      clearTimeout(timer);
    };
  }, [url, first_ms, every_ms]);

  return { state, error };
}
