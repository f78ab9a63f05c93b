// A general line chart in the shared axis style: several series (lines, dots or stems), vertical
// and horizontal markers, an optional extra grid (e.g. one line per UI), a legend and a hover readout.
import { useMemo, useState } from "react";
import { ChartAxisBottom, ChartAxisLeft } from "./ChartAxes";
import { GridColumns, GridRows } from "@visx/grid";
import { Group } from "@visx/group";
import { scaleLinear } from "@visx/scale";
import { LinePath } from "@visx/shape";
import { localPoint } from "@visx/event";
import { axisStyle, chartColors, defaultMargin, formatTick, seriesColor, type Margin } from "./axisStyle";
import { useContainerWidth } from "./useContainerWidth";

/** One series. `x` and `y` have equal length; `x` ascending for the hover readout to work. */
export interface LineSeries {
  /** Stable key (also used by tests to find the series: `data-series={key}`). */
  key: string;
  /** Legend text. */
  label: string;
  x: readonly number[];
  y: readonly number[];
  /** CSS colour; defaults to the palette by position. */
  color?: string;
  /** SVG stroke-dasharray, e.g. "4 3". */
  dash?: string;
  /** "line" (default), "dots" (markers only) or "stems" (a line from 0 to each point, with a dot). */
  kind?: "line" | "dots" | "stems";
  strokeWidth?: number;
  /** Leave this series out of the legend and the hover readout (e.g. reference lines). */
  quiet?: boolean;
}

/** A vertical marker line at `x` with an optional label at its top. */
export interface VerticalMarker {
  x: number;
  label?: string;
  color?: string;
  dash?: string;
}

/** A horizontal marker line at `y` with an optional label at its right end. */
export interface HorizontalMarker {
  y: number;
  label?: string;
  color?: string;
  dash?: string;
}

export interface LineChartProps {
  series: readonly LineSeries[];
  /** Axis titles, always with the unit: "Frequency (GHz)". */
  xLabel: string;
  yLabel: string;
  /** Accessible name of the chart (the SVG's aria-label). */
  ariaLabel: string;
  /** Fixed domains; by default the data's extent (y padded by 5 %). */
  xDomain?: readonly [number, number];
  yDomain?: readonly [number, number];
  /** Whether the automatic y domain must include 0 (default true). */
  yIncludesZero?: boolean;
  /** Whether the automatic y domain stretches to show every horizontal marker (default true). */
  markersInDomain?: boolean;
  verticalMarkers?: readonly VerticalMarker[];
  horizontalMarkers?: readonly HorizontalMarker[];
  /** Extra vertical grid lines at these x values (e.g. every UI), drawn faintly under the data. */
  xGridAt?: readonly number[];
  xTickFormat?: (v: number) => string;
  yTickFormat?: (v: number) => string;
  /** Readout formatting of values in the hover box (defaults to the tick formats). */
  xReadout?: (v: number) => string;
  yReadout?: (v: number) => string;
  /** Plot height in pixels including axes (default 280). */
  height?: number;
  /** Width drawn before the container is measured (server render; default 560): give full-width charts a wider one. */
  initialWidth?: number;
  /** Show the legend when there is more than one series (default true). */
  legend?: boolean;
  margin?: Margin;
}

function extent(values: Iterable<number>): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (!Number.isFinite(v)) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  if (lo === Infinity) return [0, 1];
  if (lo === hi) return [lo - 1, hi + 1];
  return [lo, hi];
}

function nearestIndex(xs: readonly number[], x: number): number {
  let lo = 0;
  let hi = xs.length - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (xs[mid] < x) lo = mid;
    else hi = mid;
  }
  return Math.abs(xs[lo] - x) <= Math.abs(xs[hi] - x) ? lo : hi;
}

/** A responsive line chart; it fills its container's width. */
export default function LineChart(props: LineChartProps) {
  const { ref, width } = useContainerWidth(props.initialWidth);
  const height = props.height ?? 280;
  const margin = props.margin ?? defaultMargin;
  const innerW = Math.max(10, width - margin.left - margin.right);
  const innerH = Math.max(10, height - margin.top - margin.bottom);
  const [hoverX, setHoverX] = useState<number | null>(null);

  const xDomain = useMemo(
    () => props.xDomain ?? extent(props.series.flatMap((s) => s.x)),
    [props.xDomain, props.series],
  );
  const yDomain = useMemo(() => {
    if (props.yDomain) return props.yDomain;
    const inX = (i: number, s: LineSeries) => s.x[i] >= xDomain[0] && s.x[i] <= xDomain[1];
    const ys = props.series.flatMap((s) => s.y.filter((_, i) => inX(i, s)));
    if (props.yIncludesZero ?? true) ys.push(0);
    if (props.markersInDomain ?? true) for (const m of props.horizontalMarkers ?? []) ys.push(m.y);
    const [lo, hi] = extent(ys);
    const pad = (hi - lo) * 0.05;
    return [lo - pad, hi + pad] as const;
  }, [props.yDomain, props.series, props.horizontalMarkers, props.yIncludesZero, props.markersInDomain, xDomain]);

  const xScale = scaleLinear<number>({ domain: [xDomain[0], xDomain[1]], range: [0, innerW] });
  const yScale = scaleLinear<number>({ domain: [yDomain[0], yDomain[1]], range: [innerH, 0] });
  const xFmt = props.xTickFormat ?? formatTick;
  const yFmt = props.yTickFormat ?? formatTick;
  const clipId = `clip-${props.ariaLabel.replace(/[^A-Za-z0-9]/g, "")}`;
  const visible = (s: LineSeries) =>
    s.x
      .map((x, i) => [x, s.y[i]] as const)
      .filter(([x, y]) => Number.isFinite(y) && x >= xDomain[0] && x <= xDomain[1]);

  const readout =
    hoverX === null
      ? null
      : props.series
          .map((s, i) => ({ s, i }))
          .filter(({ s }) => s.x.length > 0 && !s.quiet)
          .map(({ s, i }) => {
            const k = nearestIndex(s.x, hoverX);
            return { key: s.key, label: s.label, color: s.color ?? seriesColor(i), x: s.x[k], y: s.y[k] };
          });

  function onMove(event: React.PointerEvent<SVGRectElement>) {
    const p = localPoint(event);
    if (!p) return;
    setHoverX(xScale.invert(p.x - margin.left));
  }

  return (
    <div ref={ref} className="relative w-full">
      <svg width={width} height={height} role="img" aria-label={props.ariaLabel} className="block">
        <defs>
          <clipPath id={clipId}>
            <rect x={0} y={0} width={innerW} height={innerH} />
          </clipPath>
        </defs>
        <Group left={margin.left} top={margin.top}>
          <GridRows scale={yScale} width={innerW} stroke={axisStyle.gridStroke} numTicks={6} />
          <GridColumns scale={xScale} height={innerH} stroke={axisStyle.gridStroke} numTicks={8} />
          {props.xGridAt && (
            <g aria-hidden>
              {props.xGridAt
                .filter((x) => x >= xDomain[0] && x <= xDomain[1])
                .map((x) => (
                  <line
                    key={x}
                    x1={xScale(x)}
                    x2={xScale(x)}
                    y1={0}
                    y2={innerH}
                    stroke={chartColors.line}
                    strokeDasharray="2 3"
                  />
                ))}
            </g>
          )}
          {yDomain[0] < 0 && yDomain[1] > 0 && (
            <line x1={0} x2={innerW} y1={yScale(0)} y2={yScale(0)} stroke={chartColors.lineStrong} />
          )}
          <g clipPath={`url(#${clipId})`}>
            {props.series.map((s, i) => {
              const color = s.color ?? seriesColor(i);
              const pts = visible(s);
              const kind = s.kind ?? "line";
              return (
                <g key={s.key} data-series={s.key}>
                  {kind === "line" && (
                    <LinePath
                      data={pts as [number, number][]}
                      x={(d) => xScale(d[0])}
                      y={(d) => yScale(d[1])}
                      stroke={color}
                      strokeWidth={s.strokeWidth ?? 1.75}
                      strokeDasharray={s.dash}
                      fill="none"
                    />
                  )}
                  {kind === "stems" &&
                    pts.map(([x, y]) => (
                      <line
                        key={x}
                        x1={xScale(x)}
                        x2={xScale(x)}
                        y1={yScale(0)}
                        y2={yScale(y)}
                        stroke={color}
                        strokeWidth={1.25}
                      />
                    ))}
                  {(kind === "dots" || kind === "stems") &&
                    pts.map(([x, y]) => <circle key={x} cx={xScale(x)} cy={yScale(y)} r={3} fill={color} />)}
                </g>
              );
            })}
          </g>
          {props.horizontalMarkers?.map((m) =>
            m.y < yDomain[0] || m.y > yDomain[1] ? null : (
              <g key={`h${m.y}`}>
                <line
                  x1={0}
                  x2={innerW}
                  y1={yScale(m.y)}
                  y2={yScale(m.y)}
                  stroke={m.color ?? chartColors.bad}
                  strokeDasharray={m.dash ?? "5 4"}
                />
                {m.label && (
                  <text
                    x={innerW - 4}
                    y={yScale(m.y) - 4}
                    textAnchor="end"
                    fontSize={10}
                    fontFamily={axisStyle.font.sans}
                    fill={m.color ?? chartColors.bad}
                  >
                    {m.label}
                  </text>
                )}
              </g>
            ),
          )}
          {props.verticalMarkers?.map((m) =>
            m.x < xDomain[0] || m.x > xDomain[1] ? null : (
              <g key={`v${m.x}`}>
                <line
                  x1={xScale(m.x)}
                  x2={xScale(m.x)}
                  y1={0}
                  y2={innerH}
                  stroke={m.color ?? chartColors.accent}
                  strokeDasharray={m.dash ?? "5 4"}
                />
                {m.label && (
                  <text
                    x={xScale(m.x) + (xScale(m.x) > innerW * 0.7 ? -4 : 4)}
                    y={11}
                    textAnchor={xScale(m.x) > innerW * 0.7 ? "end" : "start"}
                    fontSize={10}
                    fontFamily={axisStyle.font.sans}
                    fill={m.color ?? chartColors.accent}
                  >
                    {m.label}
                  </text>
                )}
              </g>
            ),
          )}
          <ChartAxisLeft scale={yScale} tickFormat={yFmt} label={props.yLabel} />
          <ChartAxisBottom
            top={innerH}
            scale={xScale}
            numTicks={Math.max(2, Math.floor(innerW / 70))}
            tickFormat={xFmt}
            label={props.xLabel}
          />
          {hoverX !== null && (
            <line
              x1={xScale(hoverX)}
              x2={xScale(hoverX)}
              y1={0}
              y2={innerH}
              stroke={chartColors.muted}
              strokeWidth={0.75}
            />
          )}
          <rect
            width={innerW}
            height={innerH}
            fill="transparent"
            onPointerMove={onMove}
            onPointerLeave={() => setHoverX(null)}
          />
        </Group>
      </svg>
      {readout && hoverX !== null && (
        <div
          className="pointer-events-none absolute rounded border border-line bg-surface/95 px-2 py-1 text-xs shadow-sm"
          style={{
            top: margin.top + 4,
            left: xScale(hoverX) + margin.left > width * 0.6 ? undefined : xScale(hoverX) + margin.left + 10,
            right: xScale(hoverX) + margin.left > width * 0.6 ? width - (xScale(hoverX) + margin.left) + 10 : undefined,
          }}
        >
          {readout.map((r) => (
            <div key={r.key} className="num whitespace-nowrap">
              <span style={{ color: r.color }}>●</span> {r.label}: {(props.xReadout ?? xFmt)(r.x)} →{" "}
              {(props.yReadout ?? yFmt)(r.y)}
            </div>
          ))}
        </div>
      )}
      {(props.legend ?? true) && props.series.filter((s) => !s.quiet).length > 1 && (
        <ul className="mt-1 flex flex-wrap gap-x-4 gap-y-1 pl-14 text-xs text-ink-soft" aria-label="Legend">
          {props.series.map((s, i) =>
            s.quiet ? null : (
              <li key={s.key} className="flex items-center gap-1.5">
                <svg width={18} height={8} aria-hidden>
                  {s.kind === "dots" ? (
                    <circle cx={9} cy={4} r={3} fill={s.color ?? seriesColor(i)} />
                  ) : (
                    <line
                      x1={0}
                      x2={18}
                      y1={4}
                      y2={4}
                      stroke={s.color ?? seriesColor(i)}
                      strokeWidth={2}
                      strokeDasharray={s.dash}
                    />
                  )}
                </svg>
                {s.label}
              </li>
            ),
          )}
        </ul>
      )}
    </div>
  );
}
