// Channel classes of a tap table: bins of insertion loss at Nyquist, or classes named by hand.
import type { Grouping } from "./tapTables";

/** A channel as grouping needs it. */
export interface GroupableChannel {
  id: number;
  name: string;
  lossAtNyquist_dB: number | null;
}

/** A class of channels. */
export interface ChannelClass<T extends GroupableChannel> {
  name: string;
  lossRange_dB: [number | null, number | null] | null;
  channels: T[];
}

/** Thrown when channels cannot be grouped as asked; the message says which and why. */
export class GroupingError extends Error {
  constructor(
    message: string,
    readonly path: string,
  ) {
    super(message);
  }
}

/** Bin names: "< 12 dB", "12–20 dB", "≥ 28 dB". */
function binName(lo: number | null, hi: number | null): string {
  if (lo === null && hi === null) return "All channels";
  if (lo === null) return `Loss < ${hi} dB`;
  if (hi === null) return `Loss ≥ ${lo} dB`;
  return `Loss ${lo}–${hi} dB`;
}

/**
 * The classes of a grouping, in order (bins from low to high loss; manual classes as given).
 * Empty bins are dropped; a channel without a known loss at Nyquist cannot go into a bin.
 *
 * @param channels - every channel the grouping names, by id.
 */
export function classesOf<T extends GroupableChannel>(
  grouping: Grouping,
  channels: ReadonlyMap<number, T>,
): ChannelClass<T>[] {
  if (grouping.mode === "manual") {
    return grouping.classes.map((c, i) => ({
      name: c.name,
      lossRange_dB: null,
      channels: c.channelIds.map((id, j) => {
        const ch = channels.get(id);
        if (!ch) throw new GroupingError(`Channel ${id} was not found.`, `grouping.classes.${i}.channelIds.${j}`);
        return ch;
      }),
    }));
  }
  const edges = grouping.edges_dB;
  const bounds: [number | null, number | null][] = [];
  for (let i = 0; i <= edges.length; i++)
    bounds.push([i === 0 ? null : edges[i - 1], i === edges.length ? null : edges[i]]);
  const bins: T[][] = bounds.map(() => []);
  grouping.channelIds.forEach((id, j) => {
    const ch = channels.get(id);
    if (!ch) throw new GroupingError(`Channel ${id} was not found.`, `grouping.channelIds.${j}`);
    if (ch.lossAtNyquist_dB === null) {
      throw new GroupingError(
        `“${ch.name}” has no insertion loss at Nyquist (it came from a time-domain file), so it cannot go into a loss bin; group the channels by hand.`,
        `grouping.channelIds.${j}`,
      );
    }
    const k = edges.findIndex((e) => ch.lossAtNyquist_dB! < e);
    bins[k === -1 ? edges.length : k].push(ch);
  });
  return bounds
    .map((b, i) => ({ name: binName(b[0], b[1]), lossRange_dB: b, channels: bins[i] }))
    .filter((c) => c.channels.length > 0);
}

/** Every channel id a grouping names. */
export function groupingChannelIds(grouping: Grouping): number[] {
  return grouping.mode === "manual" ? grouping.classes.flatMap((c) => c.channelIds) : grouping.channelIds;
}
