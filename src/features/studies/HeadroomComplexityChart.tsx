// Limiter headroom against complexity for the candidates of a study: each candidate's worst-case
// (filled) and median (hollow) headroom across the channels, joined by a bar, labelled; the
// frontier of worst-case headroom over tap count; the required headroom as a dashed line.
import { ChartAxisBottom, ChartAxisLeft } from "@/components/charts/ChartAxes";
import { GridColumns, GridRows } from "@visx/grid";
import { Group } from "@visx/group";
import { scaleLinear } from "@visx/scale";
import { axisStyle, chartColors, defaultMargin, formatTick } from "@/components/charts/axisStyle";
import { useContainerWidth } from "@/components/charts/useContainerWidth";
import { frontierKeys } from "./studies";

export interface ChartCandidate {
  key: string;
  label: string;
  complexity: number;
  worstHeadroom_V: number;
  medianHeadroom_V: number;
}

interface Props {
  candidates: ChartCandidate[];
  requiredHeadroom_V: number;
  /** The recorded decision's candidate, drawn in the accent colour. */
  chosenKey?: string | null;
  height?: number;
}

export default function HeadroomComplexityChart(props: Props) {
  const { ref, width } = useContainerWidth();
  const height = props.height ?? 340;
  const margin = { ...defaultMargin, right: 150 };
  const innerW = Math.max(10, width - margin.left - margin.right);
  const innerH = Math.max(10, height - margin.top - margin.bottom);
  const cs = props.candidates;
  const millivolts = (v: number) => v * 1e3;
  const ys = [
    ...cs.flatMap((c) => [millivolts(c.worstHeadroom_V), millivolts(c.medianHeadroom_V)]),
    millivolts(props.requiredHeadroom_V),
    0,
  ];
  const yLo = Math.min(...ys);
  const yHi = Math.max(...ys);
  const pad = (yHi - yLo || 1) * 0.08;
  const xMax = Math.max(1, ...cs.map((c) => c.complexity));
  const xScale = scaleLinear<number>({ domain: [-0.5, xMax + 0.5], range: [0, innerW] });
  const yScale = scaleLinear<number>({ domain: [yLo - pad, yHi + pad], range: [innerH, 0] });
  const frontier = frontierKeys(cs);
  const frontierPts = cs.filter((c) => frontier.has(c.key)).sort((a, b) => a.complexity - b.complexity);
  // Candidates sharing a tap count are spread a little sideways so that both stay visible.
  const offsets = new Map<string, number>();
  const byX = new Map<number, ChartCandidate[]>();
  for (const c of cs) byX.set(c.complexity, [...(byX.get(c.complexity) ?? []), c]);
  for (const group of byX.values()) group.forEach((c, i) => offsets.set(c.key, (i - (group.length - 1) / 2) * 10));
  const xOf = (c: ChartCandidate) => xScale(c.complexity) + (offsets.get(c.key) ?? 0);

  return (
    <div ref={ref} className="w-full">
      <svg width={width} height={height} role="img" aria-label="Limiter headroom against complexity" className="block">
        <Group left={margin.left} top={margin.top}>
          <GridRows scale={yScale} width={innerW} stroke={axisStyle.gridStroke} numTicks={6} />
          <GridColumns scale={xScale} height={innerH} stroke={axisStyle.gridStroke} numTicks={Math.min(xMax + 1, 12)} />
          {yScale.domain()[0] < 0 && yScale.domain()[1] > 0 && (
            <line x1={0} x2={innerW} y1={yScale(0)} y2={yScale(0)} stroke={chartColors.lineStrong} />
          )}
          <line
            x1={0}
            x2={innerW}
            y1={yScale(millivolts(props.requiredHeadroom_V))}
            y2={yScale(millivolts(props.requiredHeadroom_V))}
            stroke={chartColors.bad}
            strokeDasharray="5 4"
          />
          <text
            x={4}
            y={yScale(millivolts(props.requiredHeadroom_V)) - 4}
            textAnchor="start"
            fontSize={10}
            fontFamily={axisStyle.font.sans}
            fill={chartColors.bad}
          >
            required {formatTick(millivolts(props.requiredHeadroom_V))} mV
          </text>
          {frontierPts.length > 1 && (
            <polyline
              points={frontierPts.map((c) => `${xOf(c)},${yScale(millivolts(c.worstHeadroom_V))}`).join(" ")}
              fill="none"
              stroke={chartColors.muted}
              strokeDasharray="3 3"
              data-testid="frontier"
            />
          )}
          {cs.map((c) => {
            const chosen = c.key === props.chosenKey;
            const color = chosen
              ? chartColors.accent
              : c.worstHeadroom_V >= props.requiredHeadroom_V
                ? chartColors.good
                : chartColors.inkSoft;
            const x = xOf(c);
            return (
              <g key={c.key} data-candidate={c.key}>
                <line
                  x1={x}
                  x2={x}
                  y1={yScale(millivolts(c.worstHeadroom_V))}
                  y2={yScale(millivolts(c.medianHeadroom_V))}
                  stroke={color}
                  strokeWidth={2}
                  opacity={0.5}
                />
                <circle
                  cx={x}
                  cy={yScale(millivolts(c.medianHeadroom_V))}
                  r={4}
                  fill={chartColors.surface}
                  stroke={color}
                  strokeWidth={1.5}
                />
                <circle cx={x} cy={yScale(millivolts(c.worstHeadroom_V))} r={chosen ? 6 : 4.5} fill={color} />
                <text
                  x={x + 9}
                  y={yScale(millivolts(c.worstHeadroom_V))}
                  fontSize={10.5}
                  fontFamily={axisStyle.font.sans}
                  fill={color}
                  dominantBaseline="middle"
                  fontWeight={chosen ? 600 : 400}
                >
                  {c.label}
                </text>
              </g>
            );
          })}
          <ChartAxisLeft scale={yScale} label="Limiter headroom (mV)" />
          <ChartAxisBottom
            top={innerH}
            scale={xScale}
            tickValues={Array.from({ length: xMax + 1 }, (_, i) => i).filter((i) => xMax <= 16 || i % 2 === 0)}
            tickFormat={String}
            label="Complexity (adjustable taps and gains)"
          />
        </Group>
      </svg>
      <ul className="mt-1 flex flex-wrap gap-x-5 gap-y-1 pl-14 text-xs text-ink-soft" aria-label="Legend">
        <li className="flex items-center gap-1.5">
          <svg width={10} height={10} aria-hidden>
            <circle cx={5} cy={5} r={4} fill={chartColors.inkSoft} />
          </svg>
          worst channel
        </li>
        <li className="flex items-center gap-1.5">
          <svg width={10} height={10} aria-hidden>
            <circle cx={5} cy={5} r={3.5} fill="white" stroke={chartColors.inkSoft} />
          </svg>
          median channel
        </li>
        <li className="flex items-center gap-1.5">
          <svg width={18} height={8} aria-hidden>
            <line x1={0} x2={18} y1={4} y2={4} stroke={chartColors.muted} strokeDasharray="3 3" />
          </svg>
          frontier (most worst-case headroom for the taps)
        </li>
        <li className="flex items-center gap-1.5">
          <svg width={10} height={10} aria-hidden>
            <circle cx={5} cy={5} r={4} fill={chartColors.good} />
          </svg>
          meets the required headroom
        </li>
        {props.chosenKey && (
          <li className="flex items-center gap-1.5">
            <svg width={10} height={10} aria-hidden>
              <circle cx={5} cy={5} r={4} fill={chartColors.accent} />
            </svg>
            chosen
          </li>
        )}
      </ul>
    </div>
  );
}
