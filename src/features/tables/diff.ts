// What changed between two versions of a tap table: classes added or removed, register codes per
// class, and every channel's headroom with its class default. Classes match by name, channels by id.
import type { ClassResult } from "./tables";

export interface CodeChange {
  field: string;
  from: number | null;
  to: number | null;
}

export interface ClassDiff {
  name: string;
  status: "added" | "removed" | "changed" | "same";
  codes: CodeChange[];
  worstHeadroom_V: { from: number | null; to: number | null };
}

export interface ChannelDiff {
  id: number;
  name: string;
  fromClass: string | null;
  toClass: string | null;
  from_V: number | null;
  to_V: number | null;
}

export interface VersionDiff {
  fromVersion: number;
  classes: ClassDiff[];
  channels: ChannelDiff[];
}

/** The difference from `prev` (version `fromVersion`) to `next`. */
export function diffVersions(fromVersion: number, prev: readonly ClassResult[], next: readonly ClassResult[]): VersionDiff {
  const before = new Map(prev.map((c) => [c.name, c]));
  const after = new Map(next.map((c) => [c.name, c]));
  const classes: ClassDiff[] = [];
  for (const c of next) {
    const old = before.get(c.name);
    const fields = new Set([...Object.keys(c.codes), ...Object.keys(old?.codes ?? {})]);
    const codes: CodeChange[] = [];
    for (const f of fields) {
      const from = old?.codes[f] ?? null;
      const to = c.codes[f] ?? null;
      if (from !== to) codes.push({ field: f, from, to });
    }
    classes.push({
      name: c.name,
      status: !old ? "added" : codes.length > 0 ? "changed" : "same",
      codes: old ? codes : [],
      worstHeadroom_V: { from: old?.worstHeadroom_V ?? null, to: c.worstHeadroom_V },
    });
  }
  for (const c of prev) {
    if (!after.has(c.name)) classes.push({ name: c.name, status: "removed", codes: [], worstHeadroom_V: { from: c.worstHeadroom_V, to: null } });
  }
  const channelsBefore = new Map(prev.flatMap((c) => c.channels.map((ch) => [ch.id, { ch, cls: c.name }] as const)));
  const channelsAfter = new Map(next.flatMap((c) => c.channels.map((ch) => [ch.id, { ch, cls: c.name }] as const)));
  const ids = [...new Set([...channelsAfter.keys(), ...channelsBefore.keys()])];
  const channels = ids.map((id) => {
    const a = channelsBefore.get(id);
    const b = channelsAfter.get(id);
    return {
      id,
      name: (b ?? a)!.ch.name,
      fromClass: a?.cls ?? null,
      toClass: b?.cls ?? null,
      from_V: a?.ch.defaultHeadroom_V ?? null,
      to_V: b?.ch.defaultHeadroom_V ?? null,
    };
  });
  return { fromVersion, classes, channels };
}
