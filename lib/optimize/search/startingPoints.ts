// Where the joint search starts in each CTLE setting: the plain FIR and the zero-forcing and MMSE
// FIRs of the channel, projected onto the FIR grid; and the list of starts each CTLE setting uses.
import { mmseEqualizer } from "../../solvers/mmse.ts";
import { zeroForcing } from "../../solvers/zeroForcing.ts";
import type { CtleChannel } from "../ctleChannel.ts";
import type { SearchSpace } from "../searchSpace.ts";
import { type FirGrid, firGrid, mainTapFor } from "./firGrid.ts";
import type { SearchState } from "./searchState.ts";

/**
 * Starting points for one CTLE channel: the plain FIR (no side taps: the CTLE and the DFE do the
 * rest — often near the optimum with a DFE), and zero-forcing and MMSE FIRs on the channel's cursors
 * at phase 0 (MMSE regularized by the noise relative to the swing), scaled to the peak swing and
 * projected onto the FIR grid (each side tap rounded to the step and clamped into its range, the
 * main tap as large as the swing allows). Illegal or failing starts are left out.
 *
 * @param channel - the channel through one CTLE setting.
 * @param space - the resolved budget (FIR spec, noise, swing).
 * @param grid - the FIR grid of `space.firSpec` (made here when not given).
 */
export function startingPoints(
  channel: CtleChannel,
  space: SearchSpace,
  grid: FirGrid = firGrid(space.firSpec),
): Float64Array[] {
  const spec = space.firSpec;
  const cursors = { h: channel.cursors(0), main: channel.pre };
  const raw: Float64Array[] = [Float64Array.from({ length: grid.tapCount }, (_, j) => (j === grid.mainIndex ? 1 : 0))];
  try {
    const m = mmseEqualizer(cursors, spec.pre, spec.post, channel.noiseRms_V / space.scale_V).taps;
    let s = 0;
    for (const c of m) s += Math.abs(c);
    if (s > 0) raw.push(Float64Array.from(m, (c) => c / s));
  } catch {
    // no MMSE start for all-zero cursors without noise
  }
  try {
    raw.push(zeroForcing(cursors, spec.pre, spec.post, { normalize: "peak-swing" }).taps);
  } catch {
    // a singular zero-forcing system gives no start
  }
  const out: Float64Array[] = [];
  for (const t of raw) {
    const q = projectOntoGrid(grid, t);
    if (q !== null) out.push(q);
  }
  return out;
}

/** FIR taps projected onto the grid: side taps rounded to the step and clamped; null when the main tap falls short. */
function projectOntoGrid(grid: FirGrid, taps: Float64Array): Float64Array | null {
  const step = grid.step;
  const q = new Float64Array(taps.length);
  let side = 0;
  for (let j = 0; j < taps.length; j++) {
    if (j === grid.mainIndex) continue;
    const [lo, hi] = grid.ranges[j];
    const k = Math.min(Math.floor(hi / step + 1e-9), Math.max(Math.ceil(lo / step - 1e-9), Math.round(taps[j] / step)));
    q[j] = k * step;
    side += Math.abs(k);
  }
  const main = mainTapFor(grid, side);
  if (main === null) return null;
  q[grid.mainIndex] = main;
  return q;
}

/** The starting points one CTLE setting is searched from. */
export interface CtleStarts {
  /** The caller's seeds for this setting, then every member's own starting points. */
  readonly all: readonly Float64Array[];
  /** How many of `all` rank the setting in the search order: the seeds and the first member's own. */
  readonly ranking: number;
}

/** The starts of CTLE setting `ctleIndex` (made on first use and kept in the state). */
export function startsFor(state: SearchState, ctleIndex: number): CtleStarts {
  const known = state.starts[ctleIndex];
  if (known !== undefined) return known;
  const seeds = state.seeds?.[ctleIndex] ?? [];
  const own = state.members.map((m) => startingPoints(m.channels[ctleIndex], m.space ?? state.space, state.grid));
  const starts: CtleStarts = { all: [...seeds, ...own.flat()], ranking: seeds.length + own[0].length };
  state.starts[ctleIndex] = starts;
  return starts;
}
