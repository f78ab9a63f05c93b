// The bathtub: log10 BER against the sampling phase, with the target BER and the eye width there.
import LineChart, { type LineSeries } from "./LineChart";
import { chartColors } from "./axisStyle";
import { berLabel } from "./DensityEye";

/** One bathtub curve: `log10Ber[i]` at `phase_UI[i]` (phase relative to the sampling instant). */
export interface BathtubCurve {
  key: string;
  label: string;
  phase_UI: readonly number[];
  log10Ber: readonly number[];
  color?: string;
  dash?: string;
}

export interface BathtubChartProps {
  curves: readonly BathtubCurve[];
  /** The target error ratio (e.g. 1e-12), drawn as a horizontal line. */
  targetBer: number;
  ariaLabel: string;
  /** Lowest log10 BER shown (default: 3 decades below the target, at least −20). */
  floorLog10?: number;
  height?: number;
}

/** Bathtub curves on a log BER axis, clipped at a floor so that error-free phases stay readable. */
export default function BathtubChart(props: BathtubChartProps) {
  const targetLog = Math.log10(props.targetBer);
  const floor = props.floorLog10 ?? Math.max(-20, Math.floor(targetLog) - 3);
  const series: LineSeries[] = props.curves.map((c) => ({
    key: c.key,
    label: c.label,
    x: c.phase_UI,
    y: c.log10Ber.map((v) => Math.max(floor, v)),
    color: c.color,
    dash: c.dash,
  }));
  return (
    <LineChart
      series={series}
      ariaLabel={props.ariaLabel}
      xLabel="Sampling phase (UI)"
      yLabel="BER"
      yDomain={[floor, 0]}
      yTickFormat={(v) => (Number.isInteger(v) ? berLabel(v) : "")}
      yReadout={(v) => (v <= floor ? `< ${berLabel(floor)}` : `10^${v.toFixed(1)}`)}
      horizontalMarkers={[{ y: targetLog, label: `target ${berLabel(Math.round(targetLog))}`, color: chartColors.bad }]}
      height={props.height}
    />
  );
}
