// A queued or running job (a tuning run, a study, a tap-table version): its progress bar, kept
// current by polling; the page reloads once the job is done or failed.
import type { JobStatus } from "./jobs";
import { useJobPolling } from "./useJobPolling";

interface Props {
  /** The address answering `{ status, progress }` (or `{ job: { status, progress } }`). */
  url: string;
  status: JobStatus;
  progress: number;
  /** What the job computes, for the bar's accessible name: "Run" → "Run progress". */
  what: string;
  /** The heading while the job waits in the queue and while it runs. */
  queuedLabel: string;
  runningLabel: string;
  /** One line on what happens meanwhile. */
  help?: string;
  /** Ask quickly for short jobs (a tuning run), more calmly for long ones. */
  timing?: { first_ms: number; every_ms: number };
  testId?: string;
}

const CALM = { first_ms: 600, every_ms: 1000 };

export default function JobProgress(props: Props) {
  const { state, error } = useJobPolling(
    props.url,
    { status: props.status, progress: props.progress },
    props.timing ?? CALM,
  );
  const pct = Math.round(state.progress * 100);
  const heading =
    state.status === "queued" ? props.queuedLabel : state.status === "running" ? props.runningLabel : "Finishing…";
  return (
    <section className="card" aria-label="Progress" aria-live="polite" data-testid={props.testId ?? "job-progress"}>
      <div className="flex items-baseline justify-between">
        <h2>{heading}</h2>
        <span className="num text-sm text-ink-soft">{pct} %</span>
      </div>
      <div
        className="mt-3 h-2.5 overflow-hidden rounded bg-line"
        role="progressbar"
        aria-label={`${props.what} progress`}
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={pct}
      >
        <div className="h-full bg-accent transition-[width] duration-300" style={{ width: `${Math.max(2, pct)}%` }} />
      </div>
      {props.help && <p className="help mt-2">{props.help}</p>}
      {error && <p className="notice notice-warn mt-2">Could not read the progress ({error}); retrying.</p>}
    </section>
  );
}
