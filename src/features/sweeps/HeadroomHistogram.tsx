// How the pairs' limiter headroom is spread: one bar per bin (count of channel × corner pairs), the
// required headroom marked, bins below it in red.
import { Group } from "@visx/group";
import { scaleLinear } from "@visx/scale";
import { axisStyle, chartColors, defaultMargin } from "@/components/charts/axisStyle";
import { ChartAxisBottom, ChartAxisLeft } from "@/components/charts/ChartAxes";
import { useContainerWidth } from "@/components/charts/useContainerWidth";
import type { HistogramBin } from "./sweeps";

interface Props {
  bins: HistogramBin[];
  required_V: number;
  height?: number;
}

export default function HeadroomHistogram(props: Props) {
  const { ref, width } = useContainerWidth();
  const height = props.height ?? 220;
  const margin = { ...defaultMargin, left: 48 };
  const innerW = Math.max(10, width - margin.left - margin.right);
  const innerH = height - margin.top - margin.bottom;
  const millivolts = (v: number) => v * 1e3;
  const lo = Math.min(millivolts(props.required_V), ...props.bins.map((b) => millivolts(b.from_V)));
  const hi = Math.max(millivolts(props.required_V), ...props.bins.map((b) => millivolts(b.to_V)));
  const pad = (hi - lo || 1) * 0.03;
  const x = scaleLinear<number>({ domain: [lo - pad, hi + pad], range: [0, innerW] });
  const y = scaleLinear<number>({
    domain: [0, Math.max(1, ...props.bins.map((b) => b.count))],
    range: [innerH, 0],
    nice: true,
  });
  return (
    <div ref={ref} className="w-full">
      <svg
        width={width}
        height={height}
        role="img"
        aria-label="Histogram of limiter headroom over all pairs"
        className="block"
      >
        <Group left={margin.left} top={margin.top}>
          {props.bins.map((b, i) => {
            const x0 = x(millivolts(b.from_V));
            const w = Math.max(2, x(millivolts(b.to_V)) - x0 - 1);
            return (
              <rect
                key={i}
                x={x0}
                y={y(b.count)}
                width={w}
                height={innerH - y(b.count)}
                fill={b.to_V <= props.required_V ? chartColors.bad : chartColors.good}
                opacity={0.8}
                data-count={b.count}
              >
                <title>{`${millivolts(b.from_V).toFixed(1)}–${millivolts(b.to_V).toFixed(1)} mV: ${b.count} pair${b.count === 1 ? "" : "s"}`}</title>
              </rect>
            );
          })}
          <line
            x1={x(millivolts(props.required_V))}
            x2={x(millivolts(props.required_V))}
            y1={0}
            y2={innerH}
            stroke={chartColors.bad}
            strokeDasharray="5 4"
          />
          <text
            x={x(millivolts(props.required_V)) + 4}
            y={10}
            fontSize={10}
            fontFamily={axisStyle.font.sans}
            fill={chartColors.bad}
          >
            required
          </text>
          <ChartAxisLeft scale={y} label="Pairs" numTicks={4} />
          <ChartAxisBottom
            top={innerH}
            scale={x}
            label="Limiter headroom at the target BER (mV)"
            numTicks={Math.max(2, Math.floor(innerW / 80))}
          />
        </Group>
      </svg>
    </div>
  );
}
