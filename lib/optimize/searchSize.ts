// How large a joint search a budget asks for, counted before anything is computed, and the limit
// past which the app refuses it (saying what to coarsen) instead of letting a job run for hours.
import { type Budget, type BudgetInput, gridValues } from "../contract/budget.ts";
import { DEFAULT_SIDE_TAP_RANGE, type TapRange } from "../equalizers/txFirConstraints.ts";
import { CONTINUOUS_SCAFFOLD_STEP, resolveBudget } from "./searchSpace.ts";

/**
 * Largest search size (CTLE settings × transmit FIR settings × sampling phases × (1 + aggressors) ×
 * channels searched together) the app starts. About 80 times the demo's "28 Gb/s NRZ backplane"
 * budget over a tap-table class of 24 channels; a search of that size runs minutes, not hours.
 */
export const MAX_SEARCH_SIZE = 1e10;

/** The factors of a joint search's size; `total` is their product. */
export interface SearchSize {
  /** Settings of the CTLE grid (both stages). */
  readonly ctleSettings: number;
  /** Transmit FIR settings the grid spans: the product of the side taps' grid positions. */
  readonly firSettings: number;
  /** Sampling phases searched per setting: the ±½ UI window, `samplesPerUi` of them. */
  readonly phases: number;
  /** Aggressors whose crosstalk every eye carries. */
  readonly aggressors: number;
  /** Channels searched together (a tap-table class), 1 for one channel. */
  readonly members: number;
  readonly total: number;
}

/** Grid positions `k·step` inside `[min, max]`, counted without listing them (`gridIndices`' rule). */
function positions([min, max]: TapRange, step: number): number {
  return Math.max(0, Math.floor(max / step + 1e-9) - Math.ceil(min / step - 1e-9) + 1);
}

function firSettings(b: Budget, step: number): number {
  const count = b.tx.pre + 1 + b.tx.post;
  let n = 1;
  for (let j = 0; j < count; j++) {
    if (j === b.tx.pre) continue;
    n *= positions(b.tx.ranges?.[j] ?? DEFAULT_SIDE_TAP_RANGE, step);
  }
  return n;
}

function ctleSettings(b: Budget): number {
  const g2 = b.ctle.gDc2_dB;
  return gridValues(b.ctle.gDc_dB).length * (g2 === undefined || typeof g2 === "number" ? 1 : gridValues(g2).length);
}

/**
 * The size of the joint search a budget asks for: CTLE settings × transmit FIR settings (side taps
 * on the step grid inside their ranges; the scaffold step for a continuous FIR) × sampling phases ×
 * (1 + aggressors) × members — an upper bound on the settings the branch and bound may visit, each
 * eye costing in proportion to the crosstalk it carries.
 *
 * @param budget - the budget (validated here; RangeError naming the field when invalid).
 * @param o - samples per UI of the channels' pulses, aggressors per channel, channels searched together.
 */
export function searchSize(
  budget: BudgetInput | Budget,
  o: { samplesPerUi: number; aggressors?: number; members?: number },
): SearchSize {
  const b = resolveBudget(budget);
  const { samplesPerUi, aggressors = 0, members = 1 } = o;
  if (!Number.isInteger(samplesPerUi) || samplesPerUi < 1)
    throw new RangeError(`samplesPerUi must be an integer ≥ 1, got ${samplesPerUi}`);
  if (!Number.isInteger(aggressors) || aggressors < 0)
    throw new RangeError(`aggressors must be an integer ≥ 0, got ${aggressors}`);
  if (!Number.isInteger(members) || members < 1) throw new RangeError(`members must be an integer ≥ 1, got ${members}`);
  const size = {
    ctleSettings: ctleSettings(b),
    firSettings: firSettings(b, b.tx.step ?? CONTINUOUS_SCAFFOLD_STEP),
    phases: samplesPerUi,
    aggressors,
    members,
  };
  return { ...size, total: size.ctleSettings * size.firSettings * size.phases * (1 + aggressors) * members };
}

/** A count for people: "9 261", "1.2e10". */
function count(n: number): string {
  return n < 1e7 ? Math.round(n).toLocaleString("en-US").replace(/,/g, " ") : n.toExponential(1).replace("e+", "e");
}

/** Steps people choose for a transmit FIR (fractions of the peak swing), coarsest last. */
const NICE_STEPS = [
  0.001, 0.002, 0.0025, 0.005, 0.01, 0.0125, 0.02, 0.025, 0.04, 0.05, 0.0625, 0.1, 0.125, 0.2, 0.25, 0.5,
];

/**
 * Why a search is too large, in words that say what to coarsen (the smallest transmit FIR step that
 * fits, when one does), or null when it fits under `limit`.
 *
 * @param budget - the budget the size was counted for.
 * @param size - its {@link searchSize}.
 * @param limit - the largest size allowed (default {@link MAX_SEARCH_SIZE}).
 */
export function searchSizeProblem(
  budget: BudgetInput | Budget,
  size: SearchSize,
  limit = MAX_SEARCH_SIZE,
): string | null {
  if (size.total <= limit) return null;
  const b = resolveBudget(budget);
  const step = b.tx.step ?? CONTINUOUS_SCAFFOLD_STEP;
  const others = size.total / Math.max(1, size.firSettings);
  const fits = NICE_STEPS.find((s) => s > step && others * firSettings(b, s) <= limit);
  const factors = [
    `${count(size.ctleSettings)} CTLE settings`,
    `${count(size.firSettings)} transmit FIR settings (${b.tx.pre} pre, ${b.tx.post} post taps at step ${step})`,
    `${size.phases} sampling phases`,
    ...(size.aggressors > 0 ? [`(1 + ${size.aggressors} aggressors)`] : []),
    ...(size.members > 1 ? [`${size.members} channels together`] : []),
  ];
  const advice = [
    ...(fits !== undefined ? [`a transmit FIR step of ${fits} or more`] : []),
    "fewer transmit FIR taps or narrower tap ranges",
    "a coarser CTLE grid (a larger gDc_dB step)",
    ...(size.members > 1 ? ["fewer channels per class"] : []),
  ];
  return `The search is too large: ${factors.join(" × ")} = ${count(size.total)}, above the limit of ${count(limit)}. Coarsen it: ${advice.join(", or ")}.`;
}
