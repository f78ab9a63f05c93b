// Keeping a queued or running job's status current: polls its address until the job ends, then
// reloads the page so that the result (or the reason it failed) renders server-side.
import { useEffect, useState } from "react";
import { api } from "@/components/api";
import { isJobFinished, type JobStatus } from "./jobs";

/** What a job's address answers at least; a kind of job may tell more (a sweep: pairs done, time left). */
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
 * The job's latest state (from `url`, answering the state itself or `{ job: state }`), and the
 * last error reading it (null once a read succeeds).
 */
export function useJobPolling<S extends { status: JobStatus }>(
  url: string,
  initial: S,
  timing: PollTiming,
): { state: S; error: string | null } {
  const [state, setState] = useState<S>(initial);
  const [error, setError] = useState<string | null>(null);
  const { first_ms, every_ms } = timing;

  useEffect(() => {
    let stop = false;
    let timer: ReturnType<typeof setTimeout>;
    async function poll() {
      try {
        const r = await api<S & { job?: S }>(url);
        const s = r.job ?? r;
        if (stop) return;
        setState(s);
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
