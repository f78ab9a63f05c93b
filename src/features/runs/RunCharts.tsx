// The rest of a tuning run's proof, below the eyes: the pulses at the limiter, the bathtub, the
// headroom over the CTLE grid, and the adaptation trajectories (LMS of the DFE taps, back-channel
// training of the transmit FIR). Arrays arrive packed as strings (see packRunCharts).
import { useMemo } from "react";
import LineChart, { type LineSeries } from "@/components/charts/LineChart";
import BathtubChart from "@/components/charts/BathtubChart";
import { chartColors, seriesColor } from "@/components/charts/axisStyle";
import { firTapLabels, unpackNumbers, type PackedRunCharts } from "./runs";

const mV = (v: number) => v * 1e3;

export default function RunCharts(props: PackedRunCharts) {
  const d = useMemo(() => {
    const time_UI = unpackNumbers(props.pulses.time_UI);
    const dfe = props.dfe && {
      ...props.dfe,
      iterations: unpackNumbers(props.dfe.iterations),
      taps: props.dfe.taps.map(unpackNumbers),
    };
    return {
      time_UI,
      before: unpackNumbers(props.pulses.before_V),
      after: unpackNumbers(props.pulses.after_V),
      tubPhase: unpackNumbers(props.bathtub.phase_UI),
      tubBer: unpackNumbers(props.bathtub.log10Ber),
      dfe,
      txTaps: props.txTraining.taps.map(unpackNumbers),
      snr: unpackNumbers(props.txTraining.snr_dB),
    };
  }, [props]);
  const ber = Math.log10(props.targetBer);

  const dfeSeries: LineSeries[] = d.dfe
    ? d.dfe.taps.flatMap((values, k) => [
        { key: `d${k + 1}`, label: `d${k + 1}`, x: d.dfe!.iterations, y: values.map(mV), color: seriesColor(k) },
        {
          key: `d${k + 1}-target`,
          label: `d${k + 1} closed form`,
          x: [d.dfe!.iterations[0], d.dfe!.iterations[d.dfe!.iterations.length - 1]],
          y: [mV(d.dfe!.target[k]), mV(d.dfe!.target[k])],
          color: seriesColor(k),
          dash: "3 3",
          strokeWidth: 1,
          quiet: true,
        },
      ])
    : [];
  const rounds = d.snr.map((_, i) => i + 1);
  const txLabels = firTapLabels(d.txTaps.length, props.txPre);
  const txSeries: LineSeries[] = d.txTaps.map((values, j) => ({
    key: `tx${j}`,
    label: txLabels[j],
    x: rounds,
    y: values,
    color: seriesColor(j),
  }));
  const snrSeries: LineSeries[] = [
    { key: "snr", label: "Slicer SNR", x: rounds, y: d.snr, color: chartColors.inkSoft },
  ];
  const several = props.surface.gDc2_dB.length > 1;
  const g = props.surface.gDc_dB;
  const halfStep = g.length > 1 ? Math.abs(g[1] - g[0]) / 2 : 0.5;
  const gridDomain = [Math.min(...g) - halfStep, Math.max(...g) + halfStep] as const;
  const surfaceSeries: LineSeries[] = props.surface.gDc2_dB.flatMap((g2, r) => {
    const points = (row: (number | null)[]) =>
      props.surface.gDc_dB.map((g, c) => [g, row[c]] as const).filter(([, h]) => h !== null) as [number, number][];
    const exact = points(props.surface.headroom_V[r]);
    const bound = points(props.surface.upperBound_V[r]);
    const name = several ? `gDC2 ${g2} dB` : "";
    return [
      {
        key: `bound-${g2}`,
        label: `${name ? `${name}: ` : ""}bound where pruned`,
        x: bound.map((p) => p[0]),
        y: bound.map((p) => mV(p[1])),
        color: chartColors.lineStrong,
        kind: "dots" as const,
      },
      {
        key: `exact-${g2}`,
        label: `${name ? `${name}: ` : ""}best found`,
        x: exact.map((p) => p[0]),
        y: exact.map((p) => mV(p[1])),
        color: seriesColor(r),
        kind: "dots" as const,
      },
    ];
  });
  const cursorTimes = d.time_UI.filter((t) => Number.isInteger(t));

  return (
    <div className="flex flex-col gap-6">
      <div className="grid gap-6 xl:grid-cols-2">
        <section className="card" aria-label="Pulses">
          <h2>Pulse at the limiter</h2>
          <p className="help mt-1">
            One symbol at the transmit swing, before and after the CTLE and transmit FIR; dots every UI are the cursors.
          </p>
          <LineChart
            ariaLabel="Pulse before and after equalization"
            xLabel="Time from the main cursor (UI)"
            yLabel="Voltage (mV)"
            xGridAt={cursorTimes}
            series={[
              {
                key: "before",
                label: "Before",
                x: d.time_UI,
                y: d.before.map(mV),
                color: chartColors.muted,
                dash: "5 3",
              },
              { key: "after", label: "After CTLE + FIR", x: d.time_UI, y: d.after.map(mV), color: chartColors.accent },
              {
                key: "after-cursors",
                label: "Cursors after",
                x: cursorTimes,
                y: d.time_UI
                  .map((t, i) => [t, d.after[i]] as const)
                  .filter(([t]) => Number.isInteger(t))
                  .map(([, v]) => mV(v)),
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
          <p className="help mt-1">
            BER against the sampling phase of the equalized eye; the eye width is where it crosses the target.
          </p>
          <BathtubChart
            ariaLabel="Bathtub"
            targetBer={props.targetBer}
            curves={[
              {
                key: "after",
                label: "After equalization",
                phase_UI: d.tubPhase,
                log10Ber: d.tubBer,
                color: chartColors.accent,
              },
            ]}
            floorLog10={Math.max(-20, Math.floor(ber) - 4)}
          />
        </section>
      </div>

      <section className="card" aria-label="Headroom over the CTLE grid">
        <h2>Limiter headroom over the CTLE grid</h2>
        <p className="help mt-1">
          For each CTLE DC gain: the best headroom where the search evaluated it exactly, and elsewhere the bound that
          let it skip the gain (no transmit FIR setting there can do better).
        </p>
        <LineChart
          ariaLabel="Headroom over the CTLE grid"
          xLabel="CTLE DC gain (dB)"
          yLabel="Limiter headroom (mV)"
          series={surfaceSeries}
          xDomain={gridDomain}
          yIncludesZero={false}
          markersInDomain={false}
          initialWidth={1100}
          verticalMarkers={[{ x: props.chosen.gDc_dB, label: `chosen ${props.chosen.gDc_dB} dB` }]}
          horizontalMarkers={[
            { y: mV(props.requiredHeadroom_V), label: `required ${mV(props.requiredHeadroom_V).toFixed(1)} mV` },
          ]}
          height={240}
        />
      </section>

      <div className="grid gap-6 xl:grid-cols-2">
        <section className="card" aria-label="DFE adaptation">
          <h2>DFE adaptation ({d.dfe ? d.dfe.variant.toUpperCase() : "none"})</h2>
          {d.dfe ? (
            <>
              <p className="help mt-1">
                The DFE taps learning from decisions with step μ = {d.dfe.mu}; dashed lines are the closed-form taps the
                search chose.
              </p>
              <LineChart
                ariaLabel="DFE tap trajectories"
                xLabel="Iteration (symbols)"
                yLabel="DFE tap (mV)"
                series={dfeSeries}
                yReadout={(v) => `${v.toFixed(2)} mV`}
              />
            </>
          ) : (
            <p className="mt-2 text-sm text-ink-soft">This budget has no DFE taps.</p>
          )}
        </section>
        <section className="card" aria-label="Transmit training">
          <h2>Back-channel transmit training</h2>
          <p className="help mt-1">
            The receiver asks the transmitter to step each tap up, down or hold, from a plain FIR, until no step
            improves its slicer SNR
            {props.txTraining.converged ? " (converged)" : " (stopped at the round limit)"}.
          </p>
          <LineChart
            ariaLabel="Transmit tap trajectories"
            xLabel="Exchange"
            yLabel="Tap (fraction of swing)"
            series={txSeries}
            yIncludesZero
            height={220}
          />
          <LineChart
            ariaLabel="Slicer SNR during training"
            xLabel="Exchange"
            yLabel="Slicer SNR (dB)"
            series={snrSeries}
            yIncludesZero={false}
            height={180}
          />
        </section>
      </div>
    </div>
  );
}
