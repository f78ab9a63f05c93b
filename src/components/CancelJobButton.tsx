// "Cancel": stops a queued or running job (a run, a study, a sweep) through its cancel route; the
// page then reloads and shows the job failed, cancelled by whoever asked.
import { useState } from "react";
import { api } from "@/components/api";

export default function CancelJobButton(props: { url: string; what: string }) {
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  async function cancel() {
    if (!confirm(`Cancel this ${props.what}? What it has computed so far is not kept.`)) return;
    setBusy(true);
    setError(null);
    try {
      await api(props.url, { method: "POST" });
      location.reload();
    } catch (e) {
      setError((e as Error).message);
      setBusy(false);
    }
  }
  return (
    <div className="flex flex-col items-end gap-1">
      <button
        type="button"
        className="btn"
        onClick={cancel}
        disabled={busy}
        data-testid="cancel-job"
        title={`Stops the ${props.what}; it ends failed and keeps its inputs`}
      >
        {busy ? "Cancelling…" : `Cancel ${props.what}`}
      </button>
      {error && <span className="text-xs text-bad">{error}</span>}
    </div>
  );
}
