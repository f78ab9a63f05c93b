// Define a corner sweep: a name, a budget, the channels, and named corners — typed in, or added from
// presets that say where their numbers come from. Shows how many pairs the sweep will compute.
import { useState } from "react";
import { useStore } from "zustand";
import type { StudyBudgetChoice, StudyChannelChoice } from "@/features/studies/newStudyStore";
import { cornerPresets, sourceLabel } from "./presets";
import { createNewSweepStore, factorKeys, type FactorKey } from "./newSweepStore";
import { MAX_PAIRS } from "./sweeps";
import ChannelChecklist from "@/features/studies/ChannelChecklist";

interface Props {
  budgets: Pick<StudyBudgetChoice, "id" | "name" | "modulation" | "bitRate_bps">[];
  channels: StudyChannelChoice[];
}

const factorLabels: Record<FactorKey, string> = {
  lossScale: "Loss ×",
  txSwingScale: "Swing ×",
  noiseScale: "Noise ×",
  jitterScale: "Jitter ×",
  sensitivityScale: "Sensitivity ×",
};

const symbolRate = (bitRate: number, modulation: string) => bitRate / (modulation === "pam4" ? 2 : 1);
function fits(c: StudyChannelChoice, b: Props["budgets"][number] | undefined): boolean {
  if (!b?.bitRate_bps) return true;
  return Math.abs(symbolRate(c.bitRate_bps, c.modulation) / symbolRate(b.bitRate_bps, b.modulation) - 1) < 0.01;
}

export default function NewSweep(props: Props) {
  const [store] = useState(() =>
    createNewSweepStore(
      props.budgets[0]?.id ?? 0,
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
  const pairs = s.channelIds.length * s.corners.length;

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
    if (id !== null) location.href = `/sweeps/${id}`;
  }
  const bad = (path: string) => s.errorPath === path || (s.errorPath?.startsWith(`${path}.`) ?? false);

  return (
    <form onSubmit={submit} aria-label="Start a corner sweep" className="flex flex-col gap-4">
      <div className="flex flex-wrap items-end gap-3">
        <label className="field grow">
          <span>Name</span>
          <input
            className="input"
            value={s.name}
            onChange={(e) => s.setName(e.target.value)}
            maxLength={200}
            required
            placeholder="Backplane lanes, temperature and voltage corners"
          />
        </label>
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
      </div>
      <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_minmax(0,2fr)]">
        <ChannelChecklist
          channels={usable}
          chosenIds={s.channelIds}
          setChannels={s.setChannels}
          toggleChannel={s.toggleChannel}
          listHeightClass="max-h-72"
        />
        <fieldset className="rounded-md border border-line p-3">
          <legend className="px-1 text-sm font-medium text-ink-soft">Corners ({s.corners.length})</legend>
          <p className="help mb-2">
            Each factor multiplies the nominal value (empty = 1). Loss scales the channel's insertion loss in dB at
            every frequency and rebuilds its pulse; the others scale the budget's transmit swing, noise, jitter (RJ and
            DJ) and limiter sensitivity.
          </p>
          <table className="table text-sm" aria-label="Corners">
            <thead>
              <tr>
                <th>Corner</th>
                {factorKeys.map((k) => (
                  <th key={k}>{factorLabels[k]}</th>
                ))}
                <th>
                  <span className="sr-only">Remove</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {s.corners.map((c, i) => (
                <tr key={i}>
                  <td>
                    <input
                      className={`input w-36 ${bad(`corners.${i}.name`) ? "border-bad" : ""}`}
                      aria-label={`Corner ${i + 1} name`}
                      value={c.name}
                      onChange={(e) => s.editCorner(i, { name: e.target.value })}
                      maxLength={60}
                    />
                  </td>
                  {factorKeys.map((k) => (
                    <td key={k}>
                      <input
                        className={`input num w-16 ${bad(`corners.${i}.${k}`) || bad(`corners.${i}`) ? "border-bad" : ""}`}
                        inputMode="decimal"
                        aria-label={`Corner ${i + 1} ${factorLabels[k].replace(" ×", "")} factor`}
                        placeholder="1"
                        value={c.factors[k]}
                        onChange={(e) => s.editCorner(i, { factor: [k, e.target.value] })}
                      />
                    </td>
                  ))}
                  <td>
                    <button
                      type="button"
                      className="btn py-0.5 text-xs"
                      onClick={() => s.removeCorner(i)}
                      aria-label={`Remove corner ${i + 1}`}
                      disabled={s.corners.length === 1}
                    >
                      ✕
                    </button>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          <div className="mt-2">
            <button type="button" className="btn py-0.5 text-xs" onClick={() => s.addBlankCorner()}>
              Add a corner
            </button>
          </div>
          <h3 className="mt-4 text-sm font-medium">Presets</h3>
          <ul className="mt-1 flex flex-col gap-1.5 text-sm" aria-label="Corner presets">
            {cornerPresets.map((p) => (
              <li key={p.key} className="flex items-baseline gap-2">
                <button
                  type="button"
                  className="btn py-0.5 text-xs"
                  onClick={() => s.addCorners(p.corners)}
                  aria-label={`Add the preset ${p.label}`}
                >
                  Add
                </button>
                <span>
                  <span className="font-medium">{p.label}</span>{" "}
                  <span className="badge bg-paper text-ink-soft" title={p.source.note}>
                    {sourceLabel(p.source)}
                  </span>
                  <span className="block text-xs text-muted">
                    {p.description} {p.source.note}
                  </span>
                </span>
              </li>
            ))}
          </ul>
        </fieldset>
      </div>
      <p className="text-sm text-ink-soft" data-testid="pair-count">
        {s.channelIds.length} channels × {s.corners.length} corners = <span className="num font-medium">{pairs}</span>{" "}
        pairs, one joint search each
        {pairs > MAX_PAIRS && <span className="text-bad"> — more than the {MAX_PAIRS} a sweep computes</span>}.
      </p>
      {s.error && (
        <p className="notice notice-bad" role="alert">
          {s.error}
        </p>
      )}
      <div>
        <button className="btn btn-primary" type="submit" disabled={s.busy || pairs === 0 || pairs > MAX_PAIRS}>
          {s.busy ? "Starting…" : "Start sweep"}
        </button>
      </div>
    </form>
  );
}
