// The house axes: @visx/axis with the one axis style, compact tick labels and a titled unit.
import { AxisBottom, AxisLeft, AxisTop } from "@visx/axis";
import type { AxisScale } from "@visx/axis";
import { axisStyle, formatTick } from "./axisStyle";

interface AxisProps {
  scale: AxisScale;
  /** The axis title, with its unit: "Voltage (mV)". Omit for an untitled mirror axis. */
  label?: string;
  numTicks?: number;
  tickValues?: number[];
  tickFormat?: (value: number) => string;
}

const common = (p: AxisProps) => ({
  scale: p.scale,
  numTicks: p.numTicks,
  tickValues: p.tickValues,
  stroke: axisStyle.stroke,
  tickStroke: axisStyle.tickStroke,
  tickLength: axisStyle.tickLength,
  tickFormat: (v: unknown) => (p.tickFormat ?? formatTick)(Number(v)),
  label: p.label,
  labelProps: axisStyle.labelProps,
});

/** The value axis on the left. */
export function ChartAxisLeft(props: AxisProps) {
  return (
    <AxisLeft
      {...common(props)}
      numTicks={props.numTicks ?? 6}
      tickLabelProps={() => axisStyle.leftTickLabelProps}
      labelOffset={36}
    />
  );
}

/** The horizontal axis at the bottom of a plot `top` pixels high. */
export function ChartAxisBottom(props: AxisProps & { top: number }) {
  return (
    <AxisBottom
      {...common(props)}
      top={props.top}
      tickLabelProps={() => axisStyle.bottomTickLabelProps}
      labelOffset={14}
    />
  );
}

/** A horizontal axis along the top (a mirror of the bottom one on tall charts). */
export function ChartAxisTop(props: AxisProps) {
  return <AxisTop {...common(props)} top={0} tickLabelProps={() => ({ ...axisStyle.bottomTickLabelProps, dy: -2 })} />;
}
