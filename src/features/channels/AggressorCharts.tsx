// A channel's aggressors: their crosstalk pulses (each from its own peak, an aggressor being
// asynchronous) and their coupling curves beside the victim's insertion loss. On the channel page and
// in the upload preview.
import { useMemo } from "react";
import LineChart, { type LineSeries } from "@/components/charts/LineChart";
import { chartColors, seriesColor } from "@/components/charts/axisStyle";
import { aggressorKindLabels } from "./aggressors";
import { pulseForChart, pulseSpanUi, type StoredCurve, type StoredPulse } from "./channels";

interface Props {
  aggressors: { name: string; kind: "next" | "fext"; pulse: StoredPulse; coupling: StoredCurve | null }[];
  /** The victim's insertion loss, drawn for comparison when known. */
  insertionLoss: StoredCurve | null;
  transfer?: string;
  height?: number;
}

export default function AggressorCharts(props: Props) {
  const pulses = useMemo<LineSeries[]>(
    () =>
      props.aggressors.map((a, i) => {
        const span = pulseSpanUi(a.pulse);
        const d = pulseForChart(a.pulse, Math.max(-span.before, -8), Math.min(span.after, 24));
        return {
          key: `xt${i}`,
          label: `${a.name} (${aggressorKindLabels[a.kind]})`,
          x: d.time_UI,
          y: d.values_mV,
          color: seriesColor(i + 1),
          dash: a.kind === "fext" ? "5 3" : undefined,
        };
      }),
    [props.aggressors],
  );
  const curves = useMemo<LineSeries[]>(() => {
    const out: LineSeries[] = [];
    const il = props.insertionLoss;
    if (il)
      out.push({
        key: "victim",
        label: `Victim ${props.transfer ?? "S21"}`,
        x: il.freqs_Hz.map((f) => f / 1e9),
        y: il.magnitude_dB,
        color: chartColors.accent,
      });
    props.aggressors.forEach((a, i) => {
      if (!a.coupling) return;
      out.push({
        key: `c${i}`,
        label: a.name,
        x: a.coupling.freqs_Hz.map((f) => f / 1e9),
        y: a.coupling.magnitude_dB.map((v) => Math.max(v, -120)),
        color: seriesColor(i + 1),
        dash: a.kind === "fext" ? "5 3" : undefined,
      });
    });
    return out;
  }, [props.aggressors, props.insertionLoss, props.transfer]);
  const ui = props.aggressors[0]?.pulse.ui_s ?? 1;
  const nyquist_GHz = 1 / (2 * ui) / 1e9;
  return (
    <div className="grid gap-6 lg:grid-cols-2">
      <section aria-label="Crosstalk pulses">
        <h3 className="mb-2">Crosstalk pulses</h3>
        <LineChart
          ariaLabel="Crosstalk pulses"
          height={props.height ?? 280}
          xLabel="Time from each aggressor's peak (UI)"
          yLabel="Crosstalk for a 1 V aggressor symbol (mV)"
          series={pulses}
          xReadout={(v) => `${v.toFixed(2)} UI`}
          yReadout={(v) => `${v.toFixed(3)} mV`}
        />
        <p className="help mt-1">
          NEXT solid, FEXT dashed. Aggressors are asynchronous: each is sampled at its own worst phase.
        </p>
      </section>
      <section aria-label="Coupling">
        <h3 className="mb-2">Coupling against the victim's loss</h3>
        {curves.length > (props.insertionLoss ? 1 : 0) ? (
          <LineChart
            ariaLabel="Coupling"
            height={props.height ?? 280}
            xLabel="Frequency (GHz)"
            yLabel="20·log₁₀|X|, 20·log₁₀|SDD21| (dB)"
            series={curves}
            yIncludesZero={false}
            verticalMarkers={[{ x: nyquist_GHz, label: `Nyquist ${nyquist_GHz.toFixed(2)} GHz` }]}
            xReadout={(v) => `${v.toFixed(2)} GHz`}
            yReadout={(v) => `${v.toFixed(1)} dB`}
          />
        ) : (
          <p className="notice notice-warn">
            These aggressors came from time-domain records, so there is no coupling curve; their pulses are what the
            engine uses.
          </p>
        )}
      </section>
    </div>
  );
}
