// What changed between two versions of a tap table: classes added, removed or changed (a class
// matches by name, or else by holding the same channels), their register codes and worst headroom,
// and per channel its class, the codes it gets and its headroom with its class default.
import type { ClassResult } from "./tapTables";

export interface CodeChange {
  field: string;
  from: number | null;
  to: number | null;
}

export interface ClassDiff {
  name: string;
  /** The previous version's name of this class, when it matched by its channels under another name. */
  renamedFrom: string | null;
  status: "added" | "removed" | "changed" | "same";
  codes: CodeChange[];
  worstHeadroom_V: { from: number | null; to: number | null };
}

export interface ChannelDiff {
  id: number;
  name: string;
  fromClass: string | null;
  toClass: string | null;
  /** Register codes that differ between the channel's old and new class defaults. */
  codes: CodeChange[];
  from_V: number | null;
  to_V: number | null;
}

export interface VersionDiff {
  fromVersion: number;
  classes: ClassDiff[];
  channels: ChannelDiff[];
}

function codeChanges(
  before: Record<string, number> | undefined,
  after: Record<string, number> | undefined,
): CodeChange[] {
  const fields = new Set([...Object.keys(after ?? {}), ...Object.keys(before ?? {})]);
  const out: CodeChange[] = [];
  for (const field of fields) {
    const from = before?.[field] ?? null;
    const to = after?.[field] ?? null;
    if (from !== to) out.push({ field, from, to });
  }
  return out;
}

const memberKey = (c: ClassResult) =>
  c.channels
    .map((ch) => ch.id)
    .sort((a, b) => a - b)
    .join(",");

/** The difference from `prev` (version `fromVersion`) to `next`. */
export function diffVersions(
  fromVersion: number,
  prev: readonly ClassResult[],
  next: readonly ClassResult[],
): VersionDiff {
  const byName = new Map(prev.map((c) => [c.name, c]));
  const byMembers = new Map(prev.map((c) => [memberKey(c), c]));
  const matched = new Set<ClassResult>();
  const classes: ClassDiff[] = next.map((c) => {
    const old = byName.get(c.name) ?? byMembers.get(memberKey(c));
    if (old) matched.add(old);
    const codes = old ? codeChanges(old.codes, c.codes) : [];
    return {
      name: c.name,
      renamedFrom: old && old.name !== c.name ? old.name : null,
      status: !old ? "added" : codes.length > 0 ? "changed" : "same",
      codes,
      worstHeadroom_V: { from: old?.worstHeadroom_V ?? null, to: c.worstHeadroom_V },
    };
  });
  for (const c of prev) {
    if (!matched.has(c))
      classes.push({
        name: c.name,
        renamedFrom: null,
        status: "removed",
        codes: [],
        worstHeadroom_V: { from: c.worstHeadroom_V, to: null },
      });
  }
  const where = (list: readonly ClassResult[]) =>
    new Map(list.flatMap((c) => c.channels.map((ch) => [ch.id, { ch, cls: c }] as const)));
  const before = where(prev);
  const after = where(next);
  const ids = [...new Set([...after.keys(), ...before.keys()])];
  const channels = ids.map((id) => {
    const a = before.get(id);
    const b = after.get(id);
    return {
      id,
      name: (b ?? a)!.ch.name,
      fromClass: a?.cls.name ?? null,
      toClass: b?.cls.name ?? null,
      codes: codeChanges(a?.cls.codes, b?.cls.codes),
      from_V: a?.ch.defaultHeadroom_V ?? null,
      to_V: b?.ch.defaultHeadroom_V ?? null,
    };
  });
  return { fromVersion, classes, channels };
}
