// A channel's pulse response (symbol-spaced cursors marked, one grid line per UI) and its insertion
// loss (Nyquist marked), side by side. Used on the channel page and in the upload preview.
import { useMemo, useState } from "react";
import LineChart from "@/components/charts/LineChart";
import { chartColors } from "@/components/charts/axisStyle";
import type { StoredCurve, StoredPulse } from "./channels";
import { pulseForChart, pulseSpanUi } from "./channels";

interface Props {
  pulse: StoredPulse;
  insertionLoss: StoredCurve | null;
  lossAtNyquist_dB: number | null;
  /** What the insertion loss is of: "S21" or "SDD21". */
  transfer?: string;
  /** Chart height in pixels (default 300). */
  height?: number;
}

const ranges = [
  { key: "near", label: "−4 … +16 UI", from: -4, to: 16 },
  { key: "wide", label: "−8 … +48 UI", from: -8, to: 48 },
  { key: "all", label: "Whole pulse", from: -Infinity, to: Infinity },
] as const;

export default function ChannelCharts(props: Props) {
  const [range, setRange] = useState<(typeof ranges)[number]["key"]>("near");
  const { pulse } = props;
  const ui_ps = pulse.ui_s * 1e12;
  const span = pulseSpanUi(pulse);
  const r = ranges.find((x) => x.key === range)!;
  const from = Math.max(-span.before, r.from);
  const to = Math.min(span.after, r.to);
  const data = useMemo(() => pulseForChart(pulse, from, to), [pulse, from, to]);
  const uiGrid = useMemo(() => data.cursorTime_UI, [data]);
  const main_mV = pulse.values_V[pulse.mainIndex] * 1e3;
  const nyquist_GHz = 1 / (2 * pulse.ui_s) / 1e9;
  const il = props.insertionLoss;

  return (
    <div className="grid gap-6 lg:grid-cols-2">
      <section aria-label="Pulse response">
        <div className="mb-2 flex flex-wrap items-baseline justify-between gap-2">
          <h3>Pulse response</h3>
          <div className="flex gap-1 text-xs" role="group" aria-label="Time span">
            {ranges.map((x) => (
              <button
                key={x.key}
                type="button"
                className={`rounded px-2 py-0.5 ${range === x.key ? "bg-accent-soft text-accent-strong" : "text-ink-soft hover:bg-paper"}`}
                aria-pressed={range === x.key}
                onClick={() => setRange(x.key)}
              >
                {x.label}
              </button>
            ))}
          </div>
        </div>
        <LineChart
          ariaLabel="Pulse response"
          height={props.height ?? 300}
          xLabel="Time from the main cursor (UI)"
          yLabel="Response to a 1 V symbol (mV)"
          series={[
            { key: "pulse", label: "Pulse response", x: data.time_UI, y: data.values_mV, color: chartColors.accent },
            {
              key: "cursors",
              label: "Cursors (one per UI)",
              x: data.cursorTime_UI,
              y: data.cursors_mV,
              color: "#3f6690",
              kind: "stems",
            },
          ]}
          xGridAt={uiGrid.length <= 80 ? uiGrid : undefined}
          verticalMarkers={[{ x: 0, label: `main cursor ${main_mV.toFixed(1)} mV`, color: chartColors.inkSoft }]}
          xReadout={(v) => `${v.toFixed(2)} UI (${(v * ui_ps).toFixed(1)} ps)`}
          yReadout={(v) => `${v.toFixed(2)} mV`}
        />
        <p className="help mt-1">
          1 UI = <span className="num">{ui_ps.toFixed(2)} ps</span>; dots are the symbol-spaced cursors the equalizers
          act on.
        </p>
      </section>
      <section aria-label="Insertion loss">
        <h3 className="mb-2">Insertion loss{props.transfer ? ` (${props.transfer})` : ""}</h3>
        {il ? (
          <LineChart
            ariaLabel="Insertion loss"
            height={props.height ?? 300}
            xLabel="Frequency (GHz)"
            yLabel={`20·log₁₀|${props.transfer ?? "S21"}| (dB)`}
            series={[
              {
                key: "il",
                label: props.transfer ?? "S21",
                x: il.freqs_Hz.map((f) => f / 1e9),
                y: il.magnitude_dB,
                color: chartColors.accent,
              },
            ]}
            verticalMarkers={[
              {
                x: nyquist_GHz,
                label: `Nyquist ${nyquist_GHz.toFixed(2)} GHz${props.lossAtNyquist_dB !== null ? `: −${props.lossAtNyquist_dB.toFixed(1)} dB` : ""}`,
              },
            ]}
            xReadout={(v) => `${v.toFixed(2)} GHz`}
            yReadout={(v) => `${v.toFixed(2)} dB`}
          />
        ) : (
          <p className="notice notice-warn">
            This channel came from a time-domain record, so there is no insertion-loss curve; the pulse response is what
            the engine uses.
          </p>
        )}
      </section>
    </div>
  );
}
