// An eye diagram as a density image on <canvas>, with BER contour lines, eye-opening markers, the
// shared axes (time in UI, voltage in mV) and a colour scale bar. Also usable for any 2-D histogram
// over time and voltage.
import { useEffect, useMemo, useRef } from "react";
import { ChartAxisBottom, ChartAxisLeft } from "./ChartAxes";
import { Group } from "@visx/group";
import { scaleLinear } from "@visx/scale";
import { axisStyle, chartColors, formatTick, type Margin } from "./axisStyle";
import { countAtLevel, densityColor, densityPixels } from "./colorMap";
import { useContainerWidth } from "./useContainerWidth";

/** A density image: `counts[row·width + col]`; cell centres on `time_UI` (columns) and `voltage_V` (rows). */
export interface DensityImage {
  width: number;
  height: number;
  counts: readonly number[];
  time_UI: readonly number[];
  /** Row centres in volts, ascending or descending (row 0 is drawn at its own voltage). */
  voltage_V: readonly number[];
}

/** Lines where the error ratio equals `10^log10Ber`; points are `[time_UI, voltage_V]`. */
export interface ContourSet {
  log10Ber: number;
  paths: ReadonlyArray<ReadonlyArray<readonly [number, number]>>;
}

/** A vertical bracket marking an eye opening at `time_UI` from `low_V` to `high_V`. */
export interface EyeOpening {
  time_UI: number;
  low_V: number;
  high_V: number;
  label?: string;
}

export interface DensityEyeProps {
  image: DensityImage;
  contours?: readonly ContourSet[];
  openings?: readonly EyeOpening[];
  /** Accessible name of the figure. */
  ariaLabel: string;
  /** Voltage axis extent in volts; by default the image's own. Give two eyes the same to compare them. */
  voltageDomain_V?: readonly [number, number];
  /** Total height in pixels (default 320). */
  height?: number;
  /** `data-testid` of the canvas. */
  testId?: string;
}

const margin: Margin = { top: 12, right: 78, bottom: 46, left: 62 };
const contourColors = ["#1f4e79", "#2b8a8a", "#5b3f8c", "#3f6690", "#2f7a4f"];
const contourDashes = [undefined, "6 3", "2 3", "8 3 2 3", "1 2"];
const superscript = (n: number) =>
  String(n)
    .split("")
    .map((c) => "⁻⁰¹²³⁴⁵⁶⁷⁸⁹"["-0123456789".indexOf(c)] ?? c)
    .join("");

/** `10⁻¹²` for −12. */
export function berLabel(log10Ber: number): string {
  return Number.isInteger(log10Ber) ? `10${superscript(log10Ber)}` : `10^${log10Ber.toFixed(1)}`;
}

function span(centres: readonly number[]): [number, number] {
  const n = centres.length;
  const step = n > 1 ? Math.abs(centres[n - 1] - centres[0]) / (n - 1) : 1;
  const lo = Math.min(centres[0], centres[n - 1]) - step / 2;
  const hi = Math.max(centres[0], centres[n - 1]) + step / 2;
  return [lo, hi];
}

/** The density eye; it fills its container's width. */
export default function DensityEye(props: DensityEyeProps) {
  const { ref, width } = useContainerWidth();
  const canvasRef = useRef<HTMLCanvasElement>(null);
  const height = props.height ?? 320;
  const innerW = Math.max(10, width - margin.left - margin.right);
  const innerH = Math.max(10, height - margin.top - margin.bottom);
  const { image } = props;

  const [t0, t1] = span(image.time_UI);
  const [v0, v1] = span(image.voltage_V);
  const vDomain = props.voltageDomain_V ?? [v0, v1];
  const xScale = scaleLinear<number>({ domain: [t0, t1], range: [0, innerW] });
  const yScale = scaleLinear<number>({ domain: [vDomain[0] * 1e3, vDomain[1] * 1e3], range: [innerH, 0] });
  const maxCount = useMemo(() => image.counts.reduce((m, c) => (c > m ? c : m), 0), [image]);

  useEffect(() => {
    const canvas = canvasRef.current;
    if (!canvas) return;
    const dpr = window.devicePixelRatio || 1;
    canvas.width = Math.round(innerW * dpr);
    canvas.height = Math.round(innerH * dpr);
    const ctx = canvas.getContext("2d");
    if (!ctx) return;
    ctx.setTransform(dpr, 0, 0, dpr, 0, 0);
    ctx.clearRect(0, 0, innerW, innerH);
    const off = document.createElement("canvas");
    off.width = image.width;
    off.height = image.height;
    const octx = off.getContext("2d");
    if (!octx) return;
    octx.putImageData(
      new ImageData(
        densityPixels(image.counts, image.width, image.height) as Uint8ClampedArray<ArrayBuffer>,
        image.width,
        image.height,
      ),
      0,
      0,
    );
    ctx.imageSmoothingEnabled = true;
    ctx.imageSmoothingQuality = "high";
    // Row 0's voltage decides whether the image is drawn upright or flipped.
    const descending = image.voltage_V[0] >= image.voltage_V[image.voltage_V.length - 1];
    const top = yScale(v1 * 1e3);
    const bottom = yScale(v0 * 1e3);
    ctx.save();
    if (descending) {
      ctx.drawImage(off, 0, top, innerW, bottom - top);
    } else {
      ctx.translate(0, bottom);
      ctx.scale(1, -1);
      ctx.drawImage(off, 0, 0, innerW, bottom - top);
    }
    ctx.restore();
  }, [image, innerW, innerH, v0, v1, yScale]);

  const gradientId = `eye-scale-${props.ariaLabel.replace(/[^A-Za-z0-9]/g, "")}`;
  const barX = innerW + 16;
  const barTicks = [0, 0.25, 0.5, 0.75, 1];

  return (
    <figure ref={ref} className="relative w-full" aria-label={props.ariaLabel}>
      <div className="relative" style={{ height }}>
        <canvas
          ref={canvasRef}
          data-testid={props.testId}
          className="absolute"
          style={{ left: margin.left, top: margin.top, width: innerW, height: innerH, background: chartColors.surface }}
          aria-hidden
        />
        <svg width={width} height={height} className="absolute left-0 top-0" role="img" aria-label={props.ariaLabel}>
          <defs>
            <linearGradient id={gradientId} x1="0" x2="0" y1="1" y2="0">
              {barTicks
                .concat([0.125, 0.375, 0.625, 0.875])
                .sort()
                .map((t) => {
                  const [r, g, b] = densityColor(0.12 + 0.88 * t);
                  return <stop key={t} offset={t} stopColor={`rgb(${r},${g},${b})`} />;
                })}
            </linearGradient>
            <clipPath id={`${gradientId}-clip`}>
              <rect width={innerW} height={innerH} />
            </clipPath>
          </defs>
          <Group left={margin.left} top={margin.top}>
            <rect width={innerW} height={innerH} fill="none" stroke={chartColors.lineStrong} />
            <line x1={xScale(0)} x2={xScale(0)} y1={0} y2={innerH} stroke={chartColors.muted} strokeDasharray="2 4" />
            <g clipPath={`url(#${gradientId}-clip)`}>
              {props.contours?.map((c, i) => (
                <g key={c.log10Ber} data-ber={c.log10Ber}>
                  {c.paths.map((path, j) => (
                    <path
                      key={j}
                      d={
                        path
                          .map(
                            ([t, v], k) =>
                              `${k === 0 ? "M" : "L"}${xScale(t).toFixed(1)},${yScale(v * 1e3).toFixed(1)}`,
                          )
                          .join("") + "Z"
                      }
                      fill="none"
                      stroke={contourColors[i % contourColors.length]}
                      strokeWidth={1.4}
                      strokeDasharray={contourDashes[i % contourDashes.length]}
                    />
                  ))}
                </g>
              ))}
              {props.openings?.map((o, i) => (
                <g key={i} stroke={chartColors.ink} fill={chartColors.ink}>
                  <line
                    x1={xScale(o.time_UI)}
                    x2={xScale(o.time_UI)}
                    y1={yScale(o.high_V * 1e3)}
                    y2={yScale(o.low_V * 1e3)}
                    strokeWidth={1.5}
                  />
                  <line
                    x1={xScale(o.time_UI) - 5}
                    x2={xScale(o.time_UI) + 5}
                    y1={yScale(o.high_V * 1e3)}
                    y2={yScale(o.high_V * 1e3)}
                    strokeWidth={1.5}
                  />
                  <line
                    x1={xScale(o.time_UI) - 5}
                    x2={xScale(o.time_UI) + 5}
                    y1={yScale(o.low_V * 1e3)}
                    y2={yScale(o.low_V * 1e3)}
                    strokeWidth={1.5}
                  />
                  {o.label && (
                    <text
                      x={xScale(o.time_UI) + 8}
                      y={(yScale(o.high_V * 1e3) + yScale(o.low_V * 1e3)) / 2}
                      fontSize={10}
                      fontFamily={axisStyle.font.mono}
                      stroke="none"
                      dominantBaseline="middle"
                      paintOrder="stroke"
                    >
                      {o.label}
                    </text>
                  )}
                </g>
              ))}
            </g>
            <ChartAxisLeft scale={yScale} label="Voltage (mV)" />
            <ChartAxisBottom
              top={innerH}
              scale={xScale}
              numTicks={Math.max(2, Math.floor(innerW / 70))}
              label="Time from the sampling instant (UI)"
            />
            <g aria-label="Colour scale: hits per cell">
              <rect
                x={barX}
                y={0}
                width={10}
                height={innerH}
                fill={`url(#${gradientId})`}
                stroke={chartColors.lineStrong}
              />
              {barTicks.map((t) => (
                <g key={t}>
                  <line
                    x1={barX + 10}
                    x2={barX + 13}
                    y1={innerH * (1 - t)}
                    y2={innerH * (1 - t)}
                    stroke={chartColors.lineStrong}
                  />
                  <text
                    x={barX + 15}
                    y={innerH * (1 - t)}
                    fontSize={9}
                    fontFamily={axisStyle.font.mono}
                    fill={chartColors.inkSoft}
                    dominantBaseline="middle"
                  >
                    {formatTick(Math.round(countAtLevel(t, maxCount)))}
                  </text>
                </g>
              ))}
              <text
                transform={`translate(${barX + 62}, ${innerH / 2}) rotate(-90)`}
                textAnchor="middle"
                fontSize={10}
                fontFamily={axisStyle.font.sans}
                fill={chartColors.inkSoft}
              >
                Hits per cell (log scale)
              </text>
            </g>
          </Group>
        </svg>
      </div>
      {props.contours && props.contours.length > 0 && (
        <figcaption className="mt-1 flex flex-wrap gap-x-4 pl-14 text-xs text-ink-soft">
          <span>BER contours:</span>
          {props.contours.map((c, i) => (
            <span key={c.log10Ber} className="flex items-center gap-1.5">
              <svg width={18} height={8} aria-hidden>
                <line
                  x1={0}
                  x2={18}
                  y1={4}
                  y2={4}
                  stroke={contourColors[i % contourColors.length]}
                  strokeWidth={2}
                  strokeDasharray={contourDashes[i % contourDashes.length]}
                />
              </svg>
              <span className="num">{berLabel(c.log10Ber)}</span>
            </span>
          ))}
        </figcaption>
      )}
    </figure>
  );
}
