// The tap-table builder: the architecture (a study's decision or by hand), the budget, the
// channels grouped into classes (loss bins with a live preview, or by hand), the register map.
import CornerSweepSelect, { type SweepChoice } from "./CornerSweepSelect";
import { useMemo, useState } from "react";
import { useStore } from "zustand";
import { describeArchitecture } from "@/features/studies/architecture";
import RegisterMapEditor from "./RegisterMapEditor";
import { classesOf } from "./grouping";
import { defaultRegisterMap } from "./registerMap";
import { tapTableArchitectureProblem } from "./architectureBudget";
import {
  architectureOf,
  createNewTapTableStore,
  groupingOf,
  type DecidedStudy,
  type TapTableBudgetChoice,
  type TapTableChannelChoice,
} from "./newTapTableStore";

interface Props {
  budgets: TapTableBudgetChoice[];
  channels: TapTableChannelChoice[];
  studies: DecidedStudy[];
  sweeps: SweepChoice[];
}

const symbolRate = (bitRate: number, modulation: string) => bitRate / (modulation === "pam4" ? 2 : 1);
function fits(c: TapTableChannelChoice, b: TapTableBudgetChoice | undefined): boolean {
  if (!b?.bitRate_bps) return true;
  return Math.abs(symbolRate(c.bitRate_bps, c.modulation) / symbolRate(b.bitRate_bps, b.modulation) - 1) < 0.01;
}

function Count(props: {
  label: string;
  value: number;
  max: number;
  onChange: (n: number) => void;
  disabled?: boolean;
}) {
  return (
    <label className="flex items-center gap-1.5 text-sm">
      <span className="text-ink-soft">{props.label}</span>
      <input
        className="input num w-14 px-1.5 py-0.5"
        type="number"
        min={0}
        max={props.max}
        step={1}
        value={props.value}
        disabled={props.disabled}
        aria-label={props.label}
        onChange={(e) => props.onChange(Math.max(0, Math.min(props.max, Math.round(Number(e.target.value) || 0))))}
      />
    </label>
  );
}

export default function NewTapTable(props: Props) {
  const [store] = useState(() => createNewTapTableStore(props));
  const s = useStore(store);
  const budget = props.budgets.find((b) => b.id === s.budgetId);
  const usable = props.channels
    .filter((c) => fits(c, budget))
    .sort(
      (a, b) => (a.lossAtNyquist_dB ?? Infinity) - (b.lossAtNyquist_dB ?? Infinity) || a.name.localeCompare(b.name),
    );
  const arch = architectureOf(s, props.studies);
  const study = props.studies.find((x) => x.id === s.studyId);
  const problem = arch ? tapTableArchitectureProblem(arch) : null;
  const map = useMemo(
    () => s.customMap ?? (arch && budget && !problem ? defaultRegisterMap(arch, budget.params) : []),
    [s.customMap, arch, budget, problem],
  );
  const grouping = groupingOf(s);
  const preview = useMemo(() => {
    if (typeof grouping === "string") return grouping;
    try {
      return classesOf(grouping, new Map(props.channels.map((c) => [c.id, c])));
    } catch (e) {
      return (e as Error).message;
    }
  }, [grouping, props.channels]);
  const classNames = [...new Set(Object.values(s.assignment).filter(Boolean))];

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
    if (id !== null) location.href = `/tables/${id}`;
  }

  return (
    <form onSubmit={submit} aria-label="Build a tap table" className="flex flex-col gap-6">
      <div className="grid gap-3 md:grid-cols-2">
        <label className="field">
          <span>Name</span>
          <input
            className="input"
            required
            maxLength={200}
            value={s.name}
            onChange={(e) => s.set({ name: e.target.value })}
            placeholder="e.g. Line card backplane defaults"
          />
        </label>
        <label className="field">
          <span>Description (optional)</span>
          <input
            className="input"
            maxLength={2000}
            value={s.description}
            onChange={(e) => s.set({ description: e.target.value })}
          />
        </label>
      </div>

      <fieldset className="rounded-md border border-line p-4">
        <legend className="px-1 font-semibold">Architecture</legend>
        <div className="flex flex-col gap-3">
          <label className="flex items-center gap-2 text-sm">
            <input
              type="radio"
              name="source"
              checked={s.source === "study"}
              disabled={props.studies.length === 0}
              onChange={() => s.useStudy(props.studies[0]?.id ?? null)}
            />
            From a study's decision{" "}
            {props.studies.length === 0 && <span className="text-muted">(no study has a recorded decision yet)</span>}
          </label>
          {s.source === "study" && (
            <div className="ml-6 flex flex-col gap-2">
              <select
                className="input max-w-xl"
                aria-label="Study"
                value={s.studyId ?? ""}
                onChange={(e) => s.useStudy(Number(e.target.value))}
              >
                {props.studies.map((x) => (
                  <option key={x.id} value={x.id}>
                    {x.name} — {x.architecture.label}
                  </option>
                ))}
              </select>
              {study && (
                <p className="max-w-3xl border-l-2 border-accent/40 pl-3 text-sm text-ink-soft">{study.rationale}</p>
              )}
            </div>
          )}
          <label className="flex items-center gap-2 text-sm">
            <input type="radio" name="source" checked={s.source === "manual"} onChange={() => s.useStudy(null)} />
            Picked by hand
          </label>
          {s.source === "manual" && (
            <div className="ml-6 flex flex-wrap items-center gap-x-6 gap-y-2">
              <span className="flex items-center gap-2">
                <label className="flex items-center gap-1.5 text-sm">
                  <input
                    type="checkbox"
                    checked={s.manual.tx !== null}
                    onChange={(e) => s.setManual({ tx: e.target.checked ? { pre: 1, post: 1 } : null })}
                  />
                  TX FIR
                </label>
                <Count
                  label="pre"
                  value={s.manual.tx?.pre ?? 0}
                  max={4}
                  disabled={!s.manual.tx}
                  onChange={(pre) => s.setManual({ tx: { pre, post: s.manual.tx?.post ?? 1 } })}
                />
                <Count
                  label="post"
                  value={s.manual.tx?.post ?? 0}
                  max={8}
                  disabled={!s.manual.tx}
                  onChange={(post) => s.setManual({ tx: { pre: s.manual.tx?.pre ?? 1, post } })}
                />
              </span>
              <span className="text-sm text-ink-soft">CTLE (the budget's grid)</span>
              <span className="flex items-center gap-2">
                <label className="flex items-center gap-1.5 text-sm">
                  <input
                    type="checkbox"
                    checked={!!s.manual.ffe}
                    onChange={(e) => s.setManual({ ffe: e.target.checked ? { pre: 1, post: 3 } : null })}
                  />
                  RX FFE
                </label>
                <Count
                  label="FFE pre"
                  value={s.manual.ffe?.pre ?? 0}
                  max={8}
                  disabled={!s.manual.ffe}
                  onChange={(pre) => s.setManual({ ffe: { pre, post: s.manual.ffe?.post ?? 3 } })}
                />
                <Count
                  label="FFE post"
                  value={s.manual.ffe?.post ?? 0}
                  max={16}
                  disabled={!s.manual.ffe}
                  onChange={(post) => s.setManual({ ffe: { pre: s.manual.ffe?.pre ?? 1, post } })}
                />
              </span>
              <Count
                label="DFE taps"
                value={s.manual.dfeTaps}
                max={32}
                onChange={(dfeTaps) => s.setManual({ dfeTaps })}
              />
            </div>
          )}
          {problem && <p className="notice notice-warn">{problem}</p>}
          {arch && (
            <p className="text-sm">
              Architecture: <strong>{arch.label}</strong>
              {arch.label !== describeArchitecture(arch) && (
                <span className="text-muted"> ({describeArchitecture(arch)})</span>
              )}
            </p>
          )}
        </div>
      </fieldset>

      <fieldset className="rounded-md border border-line p-4">
        <legend className="px-1 font-semibold">Budget and channels</legend>
        <label className="field max-w-md">
          <span>Budget</span>
          <select className="input" value={s.budgetId} onChange={(e) => s.setBudget(Number(e.target.value))}>
            {props.budgets.map((b) => (
              <option key={b.id} value={b.id}>
                {b.name}
              </option>
            ))}
          </select>
        </label>
        <div className="mt-3 mb-2 flex items-center gap-2 text-sm">
          <span className="text-ink-soft">Channels ({s.channelIds.length} chosen)</span>
          <button type="button" className="btn py-0.5 text-xs" onClick={() => s.setChannels(usable.map((c) => c.id))}>
            All at this rate
          </button>
          <button type="button" className="btn py-0.5 text-xs" onClick={() => s.setChannels([])}>
            None
          </button>
        </div>
        <ul className="grid max-h-72 gap-x-6 overflow-auto text-sm sm:grid-cols-2 lg:grid-cols-3">
          {usable.map((c) => (
            <li key={c.id} className="flex items-center gap-2 border-b border-line py-1">
              <input
                type="checkbox"
                id={`ch-${c.id}`}
                checked={s.channelIds.includes(c.id)}
                onChange={() => s.toggleChannel(c.id)}
              />
              <label htmlFor={`ch-${c.id}`} className="grow">
                {c.name}
              </label>
              <span className="num text-xs text-muted">
                {c.lossAtNyquist_dB !== null ? `${c.lossAtNyquist_dB.toFixed(1)} dB` : "—"}
              </span>
              {s.mode === "manual" && s.channelIds.includes(c.id) && (
                <input
                  className="input w-28 px-1.5 py-0.5 text-xs"
                  list="class-names"
                  aria-label={`Class of ${c.name}`}
                  placeholder="Class A"
                  value={s.assignment[c.id] ?? ""}
                  onChange={(e) => s.assign(c.id, e.target.value)}
                />
              )}
            </li>
          ))}
        </ul>
        <datalist id="class-names">
          {classNames.map((n) => (
            <option key={n} value={n} />
          ))}
        </datalist>
      </fieldset>

      <fieldset className="rounded-md border border-line p-4">
        <legend className="px-1 font-semibold">Channel classes</legend>
        <div className="flex flex-wrap items-center gap-4 text-sm">
          <label className="flex items-center gap-2">
            <input
              type="radio"
              name="mode"
              checked={s.mode === "loss-bins"}
              onChange={() => s.set({ mode: "loss-bins" })}
            />
            Bins of insertion loss at Nyquist
          </label>
          {s.mode === "loss-bins" && (
            <label className="flex items-center gap-2">
              <span className="text-ink-soft">edges (dB)</span>
              <input
                className="input num w-48"
                aria-label="Bin edges in dB"
                value={s.edgesText}
                onChange={(e) => s.set({ edgesText: e.target.value })}
              />
            </label>
          )}
          <label className="flex items-center gap-2">
            <input type="radio" name="mode" checked={s.mode === "manual"} onChange={() => s.set({ mode: "manual" })} />
            By hand (type a class name beside each channel above)
          </label>
        </div>
        <div className="mt-4">
          <CornerSweepSelect sweeps={props.sweeps} value={s.sweepId} onChange={s.setSweep} />
        </div>
        {typeof preview === "string" ? (
          <p className="notice notice-warn mt-3">{preview}</p>
        ) : (
          <ul className="mt-3 grid gap-2 text-sm md:grid-cols-2" data-testid="class-preview">
            {preview.map((c) => (
              <li key={c.name} className="rounded-md bg-paper px-3 py-2">
                <strong>{c.name}</strong>{" "}
                <span className="text-muted">
                  · {c.channels.length} channel{c.channels.length === 1 ? "" : "s"}
                </span>
                <div className="text-xs text-ink-soft">{c.channels.map((ch) => ch.name).join(", ")}</div>
              </li>
            ))}
          </ul>
        )}
      </fieldset>

      <fieldset className="rounded-md border border-line p-4">
        <legend className="px-1 font-semibold">Register map</legend>
        <p className="help mb-2">
          Each class's default is quantized to these fields: codes = value / LSB, kept within the range. Edit names,
          widths and LSBs to match the silicon's registers.
        </p>
        <RegisterMapEditor fields={map} onChange={s.editMap} resetKey={s.mapKey} />
        {s.customMap && (
          <button type="button" className="btn mt-2 text-xs" onClick={s.resetMap}>
            Back to the default map
          </button>
        )}
      </fieldset>

      <label className="field">
        <span>Note for v1 (optional)</span>
        <input className="input" maxLength={2000} value={s.note} onChange={(e) => s.set({ note: e.target.value })} />
      </label>
      {s.error && (
        <p className="notice notice-bad" role="alert">
          {s.error}
        </p>
      )}
      <div>
        <button className="btn btn-primary" type="submit" disabled={s.busy || !arch || problem !== null}>
          {s.busy ? "Computing…" : "Compute v1"}
        </button>
      </div>
    </form>
  );
}
