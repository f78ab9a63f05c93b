// Start an architecture study: a budget, the channels to evaluate, and the candidate architectures.
import { useState } from "react";
import { useStore } from "zustand";
import { createNewStudyStore, type StudyBudgetChoice, type StudyChannelChoice } from "./newStudyStore";
import { describeArchitecture } from "./architecture";
import ChannelChecklist from "./ChannelChecklist";

interface Props {
  budgets: StudyBudgetChoice[];
  channels: StudyChannelChoice[];
}

const symbolRate = (bitRate: number, modulation: string) => bitRate / (modulation === "pam4" ? 2 : 1);

/** Whether a channel runs at the budget's symbol rate (when the budget states a bit rate). */
function fits(c: StudyChannelChoice, b: StudyBudgetChoice | undefined): boolean {
  if (!b?.bitRate_bps) return true;
  return Math.abs(symbolRate(c.bitRate_bps, c.modulation) / symbolRate(b.bitRate_bps, b.modulation) - 1) < 0.01;
}

export default function NewStudy(props: Props) {
  const [store] = useState(() =>
    createNewStudyStore(
      props.budgets,
      props.channels.filter((c) => fits(c, props.budgets[0])).map((c) => c.id),
    ),
  );
  const s = useStore(store);
  const budget = props.budgets.find((b) => b.id === s.budgetId);
  const usable = props.channels
    .filter((c) => fits(c, budget))
    .sort(
      (a, b) => (a.lossAtNyquist_dB ?? Infinity) - (b.lossAtNyquist_dB ?? Infinity) || a.name.localeCompare(b.name),
    );

  if (props.budgets.length === 0 || props.channels.length === 0) {
    return (
      <p className="text-sm text-muted">
        {props.channels.length === 0 ? "Add channels first." : "Create a budget first."}
      </p>
    );
  }

  async function submit(e: React.SubmitEvent<HTMLFormElement>) {
    e.preventDefault();
    const id = await s.submit();
    if (id !== null) location.href = `/studies/${id}`;
  }

  return (
    <form onSubmit={submit} aria-label="Start an architecture study" className="flex flex-col gap-4">
      <div className="flex flex-wrap items-end gap-3">
        <label className="field">
          <span>Budget</span>
          <select
            className="input max-w-80"
            value={s.budgetId}
            onChange={(e) => {
              const b = props.budgets.find((x) => x.id === Number(e.target.value));
              s.setBudget(Number(e.target.value));
              s.setChannels(props.channels.filter((c) => fits(c, b)).map((c) => c.id));
            }}
          >
            {props.budgets.map((b) => (
              <option key={b.id} value={b.id}>
                {b.name}
              </option>
            ))}
          </select>
        </label>
        <label className="field grow">
          <span>Name (optional)</span>
          <input
            className="input"
            value={s.name}
            onChange={(e) => s.setName(e.target.value)}
            placeholder={budget ? `${budget.name} · ${s.channelIds.length} channels` : ""}
            maxLength={200}
          />
        </label>
      </div>
      <div className="grid gap-4 md:grid-cols-2">
        <ChannelChecklist
          channels={usable}
          chosenIds={s.channelIds}
          setChannels={s.setChannels}
          toggleChannel={s.toggleChannel}
          listHeightClass="max-h-64"
        />
        <fieldset className="rounded-md border border-line p-3">
          <legend className="px-1 text-sm font-medium text-ink-soft">Candidate architectures</legend>
          <ul className="text-sm">
            {budget?.candidates.map((c) => (
              <li key={c.key}>
                <label className="flex items-baseline gap-2 py-0.5">
                  <input type="checkbox" checked={!s.off.includes(c.key)} onChange={() => s.toggleCandidate(c.key)} />
                  <span className="grow">{c.label}</span>
                  <span className="text-xs text-muted">{describeArchitecture(c)}</span>
                </label>
              </li>
            ))}
          </ul>
        </fieldset>
      </div>
      {s.error && (
        <p className="notice notice-bad" role="alert">
          {s.error}
        </p>
      )}
      <div>
        <button className="btn btn-primary" type="submit" disabled={s.busy || s.channelIds.length === 0}>
          {s.busy ? "Starting…" : "Start study"}
        </button>
      </div>
    </form>
  );
}
