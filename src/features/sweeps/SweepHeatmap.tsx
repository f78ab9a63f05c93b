// Limiter headroom of every channel × corner pair as a heat map (rows: channels, columns: corners),
// red below the required headroom and green above it, the binding corner of each channel outlined.
import { Group } from "@visx/group";
import { HeatmapRect } from "@visx/heatmap";
import { scaleBand, scaleLinear } from "@visx/scale";
import { axisStyle, chartColors } from "@/components/charts/axisStyle";
import { useContainerWidth } from "@/components/charts/useContainerWidth";

export interface HeatmapCell {
  /** Headroom in mV, or null when the engine refused the pair (or it is not computed yet). */
  headroom_mV: number | null;
  linearReachExhausted: boolean | null;
}

interface Props {
  channels: string[];
  corners: string[];
  /** `cells[channel][corner]`. */
  cells: HeatmapCell[][];
  /** Index of each channel's binding (worst) corner, or -1. */
  binding: number[];
  required_mV: number;
}

const ROW = 18;
const MIN_COLUMN = 56;
const MID = "#f4efe6";
const EMPTY = "#ffffff";

interface Column {
  corner: number;
  bins: { channel: number; value: number | null }[];
}

export default function SweepHeatmap(props: Props) {
  const { ref, width } = useContainerWidth();
  const longest = Math.max(0, ...props.channels.map((c) => c.length));
  const margin = { top: 86, right: 16, bottom: 12, left: Math.min(260, 24 + 6.2 * longest) };
  const innerW = Math.max(props.corners.length * MIN_COLUMN, width - margin.left - margin.right);
  const innerH = props.channels.length * ROW;
  const values = props.cells.flat().flatMap((c) => (c.headroom_mV === null ? [] : [c.headroom_mV]));
  const lo = Math.min(props.required_mV - 1, ...values);
  const hi = Math.max(props.required_mV + 1, ...values);
  const color = scaleLinear<string>({
    domain: [lo, props.required_mV, hi],
    range: [chartColors.bad, MID, chartColors.good],
    clamp: true,
  });
  const x = scaleBand<number>({ domain: props.corners.map((_, i) => i), range: [0, innerW], padding: 0.04 });
  const y = scaleBand<number>({ domain: props.channels.map((_, i) => i), range: [0, innerH], padding: 0.08 });
  const columns: Column[] = props.corners.map((_, k) => ({
    corner: k,
    bins: props.channels.map((_, c) => ({ channel: c, value: props.cells[c][k].headroom_mV })),
  }));
  const barW = Math.min(280, innerW);
  const bar = scaleLinear<number>({ domain: [lo, hi], range: [0, barW] });

  return (
    <div ref={ref} className="w-full overflow-x-auto" data-testid="sweep-heatmap">
      <svg
        width={margin.left + innerW + margin.right}
        height={margin.top + innerH + margin.bottom}
        role="img"
        aria-label="Limiter headroom per channel and corner"
        className="block"
      >
        <defs>
          <linearGradient id="sweep-scale">
            {[0, 0.25, 0.5, 0.75, 1].map((t) => (
              <stop key={t} offset={t} stopColor={color(lo + t * (hi - lo))} />
            ))}
          </linearGradient>
        </defs>
        {/* The colour scale, in mV, with the required headroom marked. */}
        <Group left={margin.left} top={10}>
          <rect width={barW} height={10} fill="url(#sweep-scale)" stroke={chartColors.lineStrong} />
          {[lo, props.required_mV, hi].map((v, i) => (
            <text
              key={i}
              x={bar(v)}
              y={24}
              fontSize={10}
              fontFamily={axisStyle.font.mono}
              fill={chartColors.inkSoft}
              textAnchor={i === 0 ? "start" : i === 2 ? "end" : "middle"}
            >
              {i === 1 ? `required ${v.toFixed(1)}` : v.toFixed(1)}
            </text>
          ))}
          <text x={barW + 8} y={9} fontSize={11} fontFamily={axisStyle.font.sans} fill={chartColors.ink}>
            Limiter headroom (mV)
          </text>
        </Group>
        <Group left={margin.left} top={margin.top}>
          {props.corners.map((name, k) => (
            <text
              key={name}
              x={(x(k) ?? 0) + x.bandwidth() / 2}
              y={-8}
              fontSize={10.5}
              fontFamily={axisStyle.font.sans}
              fill={chartColors.inkSoft}
              textAnchor="start"
              transform={`rotate(-35 ${(x(k) ?? 0) + x.bandwidth() / 2} -8)`}
            >
              {name}
            </text>
          ))}
          {props.channels.map((name, c) => (
            <text
              key={`${name}-${c}`}
              x={-8}
              y={(y(c) ?? 0) + y.bandwidth() / 2}
              fontSize={10.5}
              fontFamily={axisStyle.font.sans}
              fill={chartColors.inkSoft}
              textAnchor="end"
              dominantBaseline="middle"
            >
              {name.length > 40 ? `${name.slice(0, 39)}…` : name}
            </text>
          ))}
          <HeatmapRect<Column, Column["bins"][number]>
            data={columns}
            xScale={(k) => x(k) ?? 0}
            yScale={(c) => y(c) ?? 0}
            colorScale={(v) => (v === null || v === undefined ? EMPTY : color(v as number))}
            binWidth={x.bandwidth()}
            binHeight={y.bandwidth()}
            bins={(col) => col.bins}
            count={(b) => b.value as number}
          >
            {(heatmap) =>
              heatmap.map((column) =>
                column.map((cell) => {
                  const c = cell.row;
                  const k = cell.column;
                  const data = props.cells[c][k];
                  const binding = props.binding[c] === k;
                  return (
                    <g
                      key={`${c}-${k}`}
                      data-channel={props.channels[c]}
                      data-corner={props.corners[k]}
                      data-headroom-mv={data.headroom_mV ?? ""}
                      data-binding={binding ? "true" : undefined}
                    >
                      <title>
                        {`${props.channels[c]} · ${props.corners[k]}: ${data.headroom_mV === null ? "no result" : `${data.headroom_mV.toFixed(1)} mV`}${data.linearReachExhausted ? " · linear reach exhausted" : ""}${binding ? " · binding corner" : ""}`}
                      </title>
                      <rect
                        x={cell.x}
                        y={cell.y}
                        width={cell.width}
                        height={cell.height}
                        fill={cell.color}
                        stroke={binding ? chartColors.ink : chartColors.line}
                        strokeWidth={binding ? 2 : 0.5}
                      />
                      {data.linearReachExhausted && (
                        <circle cx={cell.x + cell.width - 5} cy={cell.y + 5} r={2.2} fill={chartColors.ink} />
                      )}
                    </g>
                  );
                }),
              )
            }
          </HeatmapRect>
        </Group>
      </svg>
      <ul className="mt-1 flex flex-wrap gap-x-5 gap-y-1 text-xs text-ink-soft" aria-label="Legend">
        <li className="flex items-center gap-1.5">
          <svg width={14} height={10} aria-hidden>
            <rect width={14} height={10} fill={MID} stroke={chartColors.ink} strokeWidth={2} />
          </svg>
          binding corner (the channel's worst)
        </li>
        <li className="flex items-center gap-1.5">
          <svg width={10} height={10} aria-hidden>
            <circle cx={5} cy={5} r={2.5} fill={chartColors.ink} />
          </svg>
          linear reach exhausted
        </li>
        <li className="flex items-center gap-1.5">
          <svg width={14} height={10} aria-hidden>
            <rect width={14} height={10} fill={EMPTY} stroke={chartColors.line} />
          </svg>
          no result
        </li>
      </ul>
    </div>
  );
}
