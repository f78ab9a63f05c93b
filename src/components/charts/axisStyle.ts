// The one axis style every Tapwright chart shares (line charts, eyes, bathtubs, tables' sparklines):
// colours from the theme, tick labels in JetBrains Mono, margins, and the series palette.
import type { TextProps } from "@visx/text";

/** Theme colours as plain values (SVG and canvas cannot read CSS variables without the DOM). */
export const chartColors = {
  ink: "#1d2024",
  inkSoft: "#4a4f57",
  muted: "#737881",
  line: "#e2dfd7",
  lineStrong: "#cbc6bb",
  surface: "#ffffff",
  accent: "#b0522a",
  good: "#2f7a4f",
  warn: "#a86a00",
  bad: "#b3261e",
} as const;

/**
 * Colours for successive series: copper, slate blue, green, plum, ochre, teal, grey. Chosen to stay
 * distinct for the common colour-vision deficiencies when paired with a dash pattern.
 */
export const seriesPalette = ["#b0522a", "#3f6690", "#2f7a4f", "#7d4e8c", "#a86a00", "#2b8a8a", "#737881"] as const;

/** The colour of series `i` (wrapping around the palette). */
export function seriesColor(i: number): string {
  return seriesPalette[((i % seriesPalette.length) + seriesPalette.length) % seriesPalette.length];
}

/** Space around the plotting area for the axes and their labels, in pixels. */
export interface Margin {
  top: number;
  right: number;
  bottom: number;
  left: number;
}

export const defaultMargin: Margin = { top: 14, right: 18, bottom: 46, left: 62 };

const monoFont = '"JetBrains Mono", ui-monospace, monospace';
const sansFont = '"Inter", ui-sans-serif, system-ui, sans-serif';

/** Props for @visx/axis AxisLeft / AxisBottom, so that every axis looks the same. */
export const axisStyle = {
  stroke: chartColors.lineStrong,
  tickStroke: chartColors.lineStrong,
  tickLength: 4,
  bottomTickLabelProps: {
    fill: chartColors.inkSoft,
    fontSize: 10,
    fontFamily: monoFont,
    textAnchor: "middle",
  } satisfies Partial<TextProps>,
  leftTickLabelProps: {
    fill: chartColors.inkSoft,
    fontSize: 10,
    fontFamily: monoFont,
    textAnchor: "end",
    verticalAnchor: "middle",
    dx: -4,
  } satisfies Partial<TextProps>,
  labelProps: {
    fill: chartColors.ink,
    fontSize: 11,
    fontFamily: sansFont,
    fontWeight: 500,
    textAnchor: "middle",
  } satisfies Partial<TextProps>,
  gridStroke: chartColors.line,
  font: { mono: monoFont, sans: sansFont },
} as const;

/** A compact number for tick labels and readouts: 3 significant digits, no trailing zeros. */
export function formatTick(value: number): string {
  if (value === 0) return "0";
  const a = Math.abs(value);
  if (a >= 1e5 || a < 1e-3) return value.toExponential(1).replace("e+", "e");
  return String(Number(value.toPrecision(3)));
}
