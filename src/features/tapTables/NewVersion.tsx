// Compute the next version of a tap table: the same inputs as the latest version unless changed
// here (another budget, other loss-bin edges), with a note on what changed.
import { useState } from "react";
import { api } from "@/components/api";
import { useSubmit } from "@/components/useSubmit";
import { parseEdges } from "./newTapTableStore";
import CornerSweepSelect, { type SweepChoice } from "./CornerSweepSelect";

interface Props {
  tableId: number;
  next: number;
  budgets: { id: number; name: string }[];
  budgetId: number;
  /** The latest version's bin edges, when it grouped by loss bins. */
  edges_dB: number[] | null;
  sweeps: SweepChoice[];
  /** The sweep whose corners the latest version holds at, or null. */
  sweepId: number | null;
}

export default function NewVersion(props: Props) {
  const [budgetId, setBudget] = useState(props.budgetId);
  const [edges, setEdges] = useState(props.edges_dB?.join(", ") ?? "");
  const [note, setNote] = useState("");
  const [sweepId, setSweep] = useState(props.sweepId);
  const { busy, error, setError, submit } = useSubmit();

  function compute(e: React.SubmitEvent<HTMLFormElement>) {
    e.preventDefault();
    const body: Record<string, unknown> = { ...(note.trim() ? { note: note.trim() } : {}) };
    if (budgetId !== props.budgetId) body.budgetId = budgetId;
    if (sweepId !== props.sweepId) body.sweepId = sweepId;
    if (props.edges_dB) {
      const parsed = parseEdges(edges);
      if (!parsed) return setError("Give the bin edges as numbers of dB, e.g. 12, 20, 28.");
      if (parsed.join() !== props.edges_dB.join()) body.edges_dB = parsed;
    }
    void submit(async () => {
      const r = await api<{ version: number }>(`/api/v1/tap-tables/${props.tableId}/versions`, {
        method: "POST",
        json: body,
      });
      location.href = `/tables/${props.tableId}?v=${r.version}`;
    });
  }

  return (
    <form onSubmit={compute} aria-label="New version" className="flex flex-col gap-3">
      <div className="flex flex-wrap items-end gap-3">
        <label className="field">
          <span>Budget</span>
          <select className="input max-w-80" value={budgetId} onChange={(e) => setBudget(Number(e.target.value))}>
            {props.budgets.map((b) => (
              <option key={b.id} value={b.id}>
                {b.name}
              </option>
            ))}
          </select>
        </label>
        {props.edges_dB && (
          <label className="field">
            <span>Loss-bin edges (dB)</span>
            <input className="input num w-48" value={edges} onChange={(e) => setEdges(e.target.value)} />
          </label>
        )}
        <label className="field grow">
          <span>What changes in v{props.next}</span>
          <input
            className="input"
            maxLength={2000}
            value={note}
            onChange={(e) => setNote(e.target.value)}
            placeholder="e.g. budget re-run with the revised noise figure"
          />
        </label>
      </div>
      <CornerSweepSelect sweeps={props.sweeps} value={sweepId} onChange={setSweep} />
      {error && (
        <p className="notice notice-bad" role="alert">
          {error}
        </p>
      )}
      <div>
        <button className="btn btn-primary" type="submit" disabled={busy}>
          {busy ? "Starting…" : `Compute v${props.next}`}
        </button>
      </div>
    </form>
  );
}
