// Every channel's limiter headroom with its class default (filled, green when it meets the required
// headroom, red otherwise) against its own optimum (hollow), one row per channel, grouped by class.
import { GridColumns } from "@visx/grid";
import { Group } from "@visx/group";
import { scaleLinear } from "@visx/scale";
import { axisStyle, chartColors } from "@/components/charts/axisStyle";
import { useContainerWidth } from "@/components/charts/useContainerWidth";
import { ChartAxisBottom, ChartAxisTop } from "@/components/charts/ChartAxes";

export interface DumbbellRow {
  name: string;
  className: string;
  default_V: number;
  own_V: number;
}

interface Props {
  rows: DumbbellRow[];
  required_V: number;
}

const ROW = 20;

export default function HeadroomDumbbell(props: Props) {
  const { ref, width } = useContainerWidth();
  const margin = { top: 34, right: 24, bottom: 46, left: 250 };
  const innerW = Math.max(10, width - margin.left - margin.right);
  // One blank row before each class after the first, for its heading.
  const layout: ({ kind: "class"; name: string } | { kind: "row"; row: DumbbellRow })[] = [];
  let last: string | null = null;
  for (const r of props.rows) {
    if (r.className !== last) layout.push({ kind: "class", name: r.className });
    layout.push({ kind: "row", row: r });
    last = r.className;
  }
  const innerH = layout.length * ROW;
  const height = innerH + margin.top + margin.bottom;
  const xs = [...props.rows.flatMap((r) => [r.default_V * 1e3, r.own_V * 1e3]), props.required_V * 1e3, 0];
  const lo = Math.min(...xs);
  const hi = Math.max(...xs);
  const pad = (hi - lo || 1) * 0.05;
  const x = scaleLinear<number>({ domain: [lo - pad, hi + pad], range: [0, innerW], nice: true });
  const numTicks = Math.max(2, Math.floor(innerW / 80));

  return (
    <div ref={ref} className="w-full">
      <svg
        width={width}
        height={height}
        role="img"
        aria-label="Limiter headroom per channel: class default against own optimum"
        className="block"
      >
        <Group left={margin.left} top={margin.top}>
          <GridColumns
            scale={x}
            height={innerH}
            stroke={axisStyle.gridStroke}
            numTicks={Math.max(2, Math.floor(innerW / 80))}
          />
          <line
            x1={x(props.required_V * 1e3)}
            x2={x(props.required_V * 1e3)}
            y1={0}
            y2={innerH}
            stroke={chartColors.bad}
            strokeDasharray="5 4"
          />
          <text
            x={x(props.required_V * 1e3) + 4}
            y={innerH - 4}
            fontSize={10}
            fontFamily={axisStyle.font.sans}
            fill={chartColors.bad}
          >
            required
          </text>
          {layout.map((item, i) => {
            const y = i * ROW + ROW / 2;
            if (item.kind === "class") {
              return (
                <text
                  key={`c-${item.name}`}
                  x={-margin.left + 4}
                  y={y}
                  fontSize={11}
                  fontWeight={600}
                  fontFamily={axisStyle.font.sans}
                  fill={chartColors.ink}
                  dominantBaseline="middle"
                >
                  {item.name}
                </text>
              );
            }
            const r = item.row;
            const ok = r.default_V >= props.required_V;
            const color = ok ? chartColors.good : chartColors.bad;
            return (
              <g key={`r-${r.name}`} data-channel={r.name}>
                <title>{r.name}</title>
                <text
                  x={-10}
                  y={y}
                  fontSize={10.5}
                  fontFamily={axisStyle.font.sans}
                  fill={chartColors.inkSoft}
                  textAnchor="end"
                  dominantBaseline="middle"
                >
                  {r.name.length > 40 ? `${r.name.slice(0, 39)}…` : r.name}
                </text>
                <line
                  x1={x(r.default_V * 1e3)}
                  x2={x(r.own_V * 1e3)}
                  y1={y}
                  y2={y}
                  stroke={chartColors.lineStrong}
                  strokeWidth={2}
                />
                <circle
                  cx={x(r.own_V * 1e3)}
                  cy={y}
                  r={4}
                  fill={chartColors.surface}
                  stroke={chartColors.inkSoft}
                  strokeWidth={1.5}
                />
                <circle cx={x(r.default_V * 1e3)} cy={y} r={4.5} fill={color} />
              </g>
            );
          })}
          <ChartAxisTop scale={x} numTicks={numTicks} />
          <ChartAxisBottom top={innerH} scale={x} numTicks={numTicks} label="Limiter headroom at the target BER (mV)" />
        </Group>
      </svg>
      <ul className="mt-1 flex flex-wrap gap-x-5 gap-y-1 pl-4 text-xs text-ink-soft" aria-label="Legend">
        <li className="flex items-center gap-1.5">
          <svg width={10} height={10} aria-hidden>
            <circle cx={5} cy={5} r={4} fill={chartColors.good} />
          </svg>
          class default (meets the required headroom)
        </li>
        <li className="flex items-center gap-1.5">
          <svg width={10} height={10} aria-hidden>
            <circle cx={5} cy={5} r={4} fill={chartColors.bad} />
          </svg>
          class default (short)
        </li>
        <li className="flex items-center gap-1.5">
          <svg width={10} height={10} aria-hidden>
            <circle cx={5} cy={5} r={3.5} fill="white" stroke={chartColors.inkSoft} />
          </svg>
          the channel's own optimum
        </li>
      </ul>
    </div>
  );
}
