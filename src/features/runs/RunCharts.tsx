// The proof of a tuning run: the eyes before and after equalization (density images with BER
// contours on shared axes), the pulses at the limiter, the bathtub, the headroom over the CTLE grid,
// and the adaptation trajectories (LMS of the DFE taps, back-channel training of the transmit FIR).
import { useMemo, useState } from "react";
import DensityEye, { type DensityImage, type ContourSet, type EyeOpening } from "@/components/charts/DensityEye";
import LineChart, { type LineSeries } from "@/components/charts/LineChart";
import BathtubChart from "@/components/charts/BathtubChart";
import { chartColors, seriesColor } from "@/components/charts/axisStyle";
import { byTap, firTapLabels, trainingSnr_dB } from "./runs";

interface EyeFigure {
  image: DensityImage;
  contours: ContourSet[];
  eyeHeight_V: number;
  samplingPhase_UI: number;
  symbols: { count: number; source: string };
}

export interface RunChartsProps {
  eyes: { before: EyeFigure; after: EyeFigure };
  pulses: { time_UI: number[]; before_V: number[]; after_V: number[] };
  bathtub: { phase_UI: number[]; log10Ber: number[] };
  surface: { gDc_dB: number[]; gDc2_dB: number[]; headroom_V: (number | null)[][]; upperBound_V: (number | null)[][] };
  adaptation: {
    dfe: { variant: string; mu: number; iterations: number[]; taps: number[][]; target: number[] } | null;
    txTraining: { taps: number[][]; objective: number[]; converged: boolean; final: number[] };
  };
  chosen: { gDc_dB: number; gDc2_dB: number };
  targetBer: number;
  modulation: "nrz" | "pam4";
  txPre: number;
  requiredHeadroom_V: number;
}

function union(a: readonly number[], b: readonly number[]): [number, number] {
  const all = [...a, ...b];
  const step = Math.abs(a[1] - a[0]);
  return [Math.min(...all) - step / 2, Math.max(...all) + step / 2];
}

const mV = (v: number) => v * 1e3;

export default function RunCharts(props: RunChartsProps) {
  const { eyes, pulses, adaptation } = props;
  const [sameScale, setSameScale] = useState(false);
  const shared = useMemo(() => union(eyes.before.image.voltage_V, eyes.after.image.voltage_V), [eyes]);
  const voltageDomain = sameScale ? shared : undefined;
  const opening = (e: EyeFigure): EyeOpening[] =>
    props.modulation === "nrz" && e.eyeHeight_V > 0 ? [{ time_UI: 0, low_V: -e.eyeHeight_V / 2, high_V: e.eyeHeight_V / 2, label: `${mV(e.eyeHeight_V).toFixed(1)} mV` }] : [];
  const ber = Math.log10(props.targetBer);

  const dfeSeries: LineSeries[] = adaptation.dfe
    ? byTap(adaptation.dfe.taps).flatMap((values, k) => [
        { key: `d${k + 1}`, label: `d${k + 1}`, x: adaptation.dfe!.iterations, y: values.map(mV), color: seriesColor(k) },
        {
          key: `d${k + 1}-target`,
          label: `d${k + 1} closed form`,
          x: [adaptation.dfe!.iterations[0], adaptation.dfe!.iterations[adaptation.dfe!.iterations.length - 1]],
          y: [mV(adaptation.dfe!.target[k]), mV(adaptation.dfe!.target[k])],
          color: seriesColor(k),
          dash: "3 3",
          strokeWidth: 1,
          quiet: true,
        },
      ])
    : [];
  const rounds = adaptation.txTraining.taps.map((_, i) => i + 1);
  const txLabels = firTapLabels(adaptation.txTraining.final.length, props.txPre);
  const txSeries: LineSeries[] = byTap(adaptation.txTraining.taps).map((values, j) => ({ key: `tx${j}`, label: txLabels[j], x: rounds, y: values, color: seriesColor(j) }));
  const snrSeries: LineSeries[] = [{ key: "snr", label: "Slicer SNR", x: rounds, y: adaptation.txTraining.objective.map(trainingSnr_dB), color: chartColors.inkSoft }];
  const several = props.surface.gDc2_dB.length > 1;
  const surfaceSeries: LineSeries[] = props.surface.gDc2_dB.flatMap((g2, r) => {
    const points = (row: (number | null)[]) =>
      props.surface.gDc_dB.map((g, c) => [g, row[c]] as const).filter(([, h]) => h !== null) as [number, number][];
    const exact = points(props.surface.headroom_V[r]);
    const bound = points(props.surface.upperBound_V[r]);
    const name = several ? `gDC2 ${g2} dB` : "";
    return [
      { key: `bound-${g2}`, label: `${name ? `${name}: ` : ""}at most (pruned)`, x: bound.map((p) => p[0]), y: bound.map((p) => mV(p[1])), color: seriesColor(r), dash: "2 3", strokeWidth: 1 },
      { key: `exact-${g2}`, label: `${name ? `${name}: ` : ""}searched exactly`, x: exact.map((p) => p[0]), y: exact.map((p) => mV(p[1])), color: seriesColor(r), kind: "dots" as const },
    ];
  });

  return (
    <div className="flex flex-col gap-6">
      <section className="card" aria-label="Eyes">
        <h2>Eyes at the limiter</h2>
        <p className="help mt-1">
          Density of a {eyes.after.symbols.source} stream ({eyes.after.symbols.count} symbols) folded over two UI; the lines are the statistical eye's
          BER contours (noise and jitter included).
        </p>
        <label className="mt-2 flex items-center gap-2 text-sm text-ink-soft">
          <input type="checkbox" checked={sameScale} onChange={(e) => setSameScale(e.target.checked)} />
          Same voltage scale for both eyes
        </label>
        <div className="mt-4 grid gap-6 xl:grid-cols-2">
          <div>
            <h3>Before: the channel alone</h3>
            <p className="help">Transmit swing only — no FIR, CTLE or DFE. {eyes.before.eyeHeight_V > 0 ? `Eye height ${mV(eyes.before.eyeHeight_V).toFixed(1)} mV.` : "The eye is closed at the target BER."}</p>
            <DensityEye
              image={eyes.before.image}
              contours={eyes.before.contours}
              openings={opening(eyes.before)}
              voltageDomain_V={voltageDomain}
              ariaLabel="Eye before equalization"
              testId="eye-before"
            />
          </div>
          <div>
            <h3>After: transmit FIR, CTLE and DFE</h3>
            <p className="help">The chosen setting, DFE feedback included. {eyes.after.eyeHeight_V > 0 ? `Eye height ${mV(eyes.after.eyeHeight_V).toFixed(1)} mV.` : "The eye is still closed at the target BER."}</p>
            <DensityEye
              image={eyes.after.image}
              contours={eyes.after.contours}
              openings={opening(eyes.after)}
              voltageDomain_V={voltageDomain}
              ariaLabel="Eye after equalization"
              testId="eye-after"
            />
          </div>
        </div>
      </section>

      <div className="grid gap-6 xl:grid-cols-2">
        <section className="card" aria-label="Pulses">
          <h2>Pulse at the limiter</h2>
          <p className="help mt-1">One symbol at the transmit swing, before and after the CTLE and transmit FIR; dots every UI are the cursors.</p>
          <LineChart
            ariaLabel="Pulse before and after equalization"
            xLabel="Time from the main cursor (UI)"
            yLabel="Voltage (mV)"
            xGridAt={pulses.time_UI.filter((t) => Number.isInteger(t))}
            series={[
              { key: "before", label: "Before", x: pulses.time_UI, y: pulses.before_V.map(mV), color: chartColors.muted, dash: "5 3" },
              { key: "after", label: "After CTLE + FIR", x: pulses.time_UI, y: pulses.after_V.map(mV), color: chartColors.accent },
              {
                key: "after-cursors",
                label: "Cursors after",
                x: pulses.time_UI.filter((t) => Number.isInteger(t)),
                y: pulses.time_UI.map((t, i) => [t, pulses.after_V[i]] as const).filter(([t]) => Number.isInteger(t)).map(([, v]) => mV(v)),
                color: chartColors.accent,
                kind: "dots",
              },
            ]}
            xReadout={(v) => `${v.toFixed(2)} UI`}
            yReadout={(v) => `${v.toFixed(2)} mV`}
          />
        </section>
        <section className="card" aria-label="Bathtub">
          <h2>Bathtub</h2>
          <p className="help mt-1">BER against the sampling phase of the equalized eye; the eye width is where it crosses the target.</p>
          <BathtubChart ariaLabel="Bathtub" targetBer={props.targetBer} curves={[{ key: "after", label: "After equalization", phase_UI: props.bathtub.phase_UI, log10Ber: props.bathtub.log10Ber, color: chartColors.accent }]} floorLog10={Math.max(-20, Math.floor(ber) - 4)} />
        </section>
      </div>

      <section className="card" aria-label="Headroom over the CTLE grid">
        <h2>Limiter headroom over the CTLE grid</h2>
        <p className="help mt-1">
          For each CTLE DC gain: the best headroom where the search evaluated it exactly (dots), and the bound that let it skip the rest
          (dashed: no transmit FIR setting there can do better).
        </p>
        <LineChart
          ariaLabel="Headroom over the CTLE grid"
          xLabel="CTLE DC gain (dB)"
          yLabel="Limiter headroom (mV)"
          series={surfaceSeries}
          verticalMarkers={[{ x: props.chosen.gDc_dB, label: `chosen ${props.chosen.gDc_dB} dB` }]}
          horizontalMarkers={[{ y: mV(props.requiredHeadroom_V), label: `required ${mV(props.requiredHeadroom_V).toFixed(1)} mV` }]}
          height={240}
        />
      </section>

      <div className="grid gap-6 xl:grid-cols-2">
        <section className="card" aria-label="DFE adaptation">
          <h2>DFE adaptation ({adaptation.dfe ? adaptation.dfe.variant.toUpperCase() : "none"})</h2>
          {adaptation.dfe ? (
            <>
              <p className="help mt-1">
                The DFE taps learning from decisions with step μ = {adaptation.dfe.mu}; dashed lines are the closed-form taps the search chose.
              </p>
              <LineChart ariaLabel="DFE tap trajectories" xLabel="Iteration (symbols)" yLabel="DFE tap (mV)" series={dfeSeries} yReadout={(v) => `${v.toFixed(2)} mV`} />
            </>
          ) : (
            <p className="mt-2 text-sm text-ink-soft">This budget has no DFE taps.</p>
          )}
        </section>
        <section className="card" aria-label="Transmit training">
          <h2>Back-channel transmit training</h2>
          <p className="help mt-1">
            The receiver asks the transmitter to step each tap up, down or hold, from a plain FIR, until no step improves its slicer SNR
            {adaptation.txTraining.converged ? " (converged)" : " (stopped at the round limit)"}.
          </p>
          <LineChart ariaLabel="Transmit tap trajectories" xLabel="Exchange" yLabel="Tap (fraction of swing)" series={txSeries} yIncludesZero height={220} />
          <LineChart ariaLabel="Slicer SNR during training" xLabel="Exchange" yLabel="Slicer SNR (dB)" series={snrSeries} yIncludesZero={false} height={180} />
        </section>
      </div>
    </div>
  );
}
