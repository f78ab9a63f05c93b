// Start a tuning run: pick a channel and a budget (one may be fixed by the page), then go to the run.
import { useState } from "react";
import { api } from "@/components/api";
import { useSubmit } from "@/components/useSubmit";
import type { Modulation } from "@lib/types";

interface ChannelChoice {
  id: number;
  name: string;
  bitRate_bps: number;
  modulation: Modulation;
  lossAtNyquist_dB: number | null;
}
interface BudgetChoice {
  id: number;
  name: string;
  modulation: Modulation;
  bitRate_bps: number | null;
}

interface Props {
  channels: ChannelChoice[];
  budgets: BudgetChoice[];
  fixedChannel?: boolean;
  fixedBudget?: boolean;
}

const symbolRate = (bitRate: number, modulation: string) => bitRate / (modulation === "pam4" ? 2 : 1);

export default function StartRun(props: Props) {
  const [channelId, setChannelId] = useState(props.channels[0]?.id ?? 0);
  const [budgetId, setBudgetId] = useState(props.budgets[0]?.id ?? 0);
  const { busy, error, submit } = useSubmit();
  const channel = props.channels.find((c) => c.id === channelId);
  const budget = props.budgets.find((b) => b.id === budgetId);
  const mismatch =
    channel && budget?.bitRate_bps
      ? Math.abs(
          symbolRate(channel.bitRate_bps, channel.modulation) / symbolRate(budget.bitRate_bps, budget.modulation) - 1,
        ) > 0.01
      : false;

  function start(e: React.FormEvent) {
    e.preventDefault();
    void submit(async () => {
      const r = await api<{ id: number }>("/api/v1/runs", { method: "POST", json: { channelId, budgetId } });
      location.href = `/runs/${r.id}`;
    });
  }

  if (props.channels.length === 0 || props.budgets.length === 0) {
    return (
      <p className="text-sm text-muted">
        {props.channels.length === 0 ? "Add a channel first." : "Create a budget first."}
      </p>
    );
  }
  return (
    <form className="flex flex-wrap items-end gap-3" onSubmit={start} aria-label="Start a tuning run">
      {!props.fixedChannel && (
        <label className="field">
          <span>Channel</span>
          <select
            className="input max-w-72"
            aria-label="Channel"
            value={channelId}
            onChange={(e) => setChannelId(Number(e.target.value))}
          >
            {props.channels.map((c) => (
              <option key={c.id} value={c.id}>
                {c.name} ({Number((c.bitRate_bps / 1e9).toPrecision(6))} Gb/s
                {c.lossAtNyquist_dB !== null ? `, ${c.lossAtNyquist_dB.toFixed(1)} dB` : ""})
              </option>
            ))}
          </select>
        </label>
      )}
      {!props.fixedBudget && (
        <label className="field">
          <span>Budget</span>
          <select
            className="input max-w-72"
            aria-label="Budget"
            value={budgetId}
            onChange={(e) => setBudgetId(Number(e.target.value))}
          >
            {props.budgets.map((b) => (
              <option key={b.id} value={b.id}>
                {b.name}
              </option>
            ))}
          </select>
        </label>
      )}
      <button className="btn btn-primary" type="submit" disabled={busy}>
        {busy ? "Starting…" : "Start tuning run"}
      </button>
      {mismatch && (
        <p className="notice notice-warn w-full text-xs">
          The channel was derived for another symbol rate than the budget states; the engine will refuse the run. Pick a
          matching pair.
        </p>
      )}
      {error && (
        <p className="notice notice-bad w-full" role="alert">
          {error}
        </p>
      )}
    </form>
  );
}
