// State of the new-sweep form: name, budget, channels and the corners (typed in or added from a
// preset), and sending. Factors are kept as the text people type; empty means nominal (1).
import { createStore } from "zustand/vanilla";
import { api } from "@/components/api";
import type { Corner } from "@lib/contract/corner";

/** The factors a corner may set, in the form's column order. */
export const factorKeys = ["lossScale", "txSwingScale", "noiseScale", "jitterScale", "sensitivityScale"] as const;
export type FactorKey = (typeof factorKeys)[number];

export interface CornerDraft {
  name: string;
  factors: Record<FactorKey, string>;
}

const blank = (): Record<FactorKey, string> => ({
  lossScale: "",
  txSwingScale: "",
  noiseScale: "",
  jitterScale: "",
  sensitivityScale: "",
});

/** A corner as the form holds it. */
export function draftOf(c: Corner): CornerDraft {
  const factors = blank();
  for (const k of factorKeys) if (c[k] !== undefined) factors[k] = String(c[k]);
  return { name: c.name, factors };
}

/** The corner a draft asks for (non-numbers go through as text, so the server names the field). */
function cornerOf(d: CornerDraft): Record<string, unknown> {
  const out: Record<string, unknown> = { name: d.name.trim() };
  for (const k of factorKeys) {
    const t = d.factors[k].trim();
    if (t !== "") out[k] = Number.isFinite(Number(t)) ? Number(t) : t;
  }
  return out;
}

export interface NewSweepState {
  name: string;
  budgetId: number;
  channelIds: number[];
  corners: CornerDraft[];
  busy: boolean;
  error: string | null;
  /** The field the server named in its refusal (e.g. corners.2.lossScale). */
  errorPath: string | null;
  setName(name: string): void;
  setBudget(id: number): void;
  toggleChannel(id: number): void;
  setChannels(ids: number[]): void;
  addCorners(list: Corner[]): void;
  addBlankCorner(): void;
  editCorner(i: number, change: Partial<CornerDraft> & { factor?: [FactorKey, string] }): void;
  removeCorner(i: number): void;
  /** Starts the sweep; resolves to its id, or null when refused (error set). */
  submit(): Promise<number | null>;
}

export function createNewSweepStore(budgetId: number, initialChannels: number[]) {
  return createStore<NewSweepState>()((set, get) => ({
    name: "",
    budgetId,
    channelIds: initialChannels,
    corners: [{ name: "nominal", factors: blank() }],
    busy: false,
    error: null,
    errorPath: null,
    setName: (name) => set({ name }),
    setBudget: (id) => set({ budgetId: id }),
    toggleChannel: (id) =>
      set((s) => ({
        channelIds: s.channelIds.includes(id) ? s.channelIds.filter((x) => x !== id) : [...s.channelIds, id],
      })),
    setChannels: (channelIds) => set({ channelIds }),
    // A preset's corners join the list; one already there by name is not added twice.
    addCorners: (list) =>
      set((s) => {
        const have = new Set(s.corners.map((c) => c.name.trim().toLowerCase()));
        return { corners: [...s.corners, ...list.filter((c) => !have.has(c.name.toLowerCase())).map(draftOf)] };
      }),
    addBlankCorner: () =>
      set((s) => ({ corners: [...s.corners, { name: `corner ${s.corners.length + 1}`, factors: blank() }] })),
    editCorner: (i, change) =>
      set((s) => ({
        corners: s.corners.map((c, j) =>
          j !== i
            ? c
            : {
                name: change.name ?? c.name,
                factors: change.factor ? { ...c.factors, [change.factor[0]]: change.factor[1] } : c.factors,
              },
        ),
      })),
    removeCorner: (i) => set((s) => ({ corners: s.corners.filter((_, j) => j !== i) })),
    async submit() {
      const s = get();
      set({ busy: true, error: null, errorPath: null });
      try {
        const r = await api<{ id: number }>("/api/v1/sweeps", {
          method: "POST",
          json: {
            name: s.name.trim(),
            budgetId: s.budgetId,
            channelIds: s.channelIds,
            corners: s.corners.map(cornerOf),
          },
        });
        return r.id;
      } catch (e) {
        set({ busy: false, error: (e as Error).message, errorPath: (e as { path?: string }).path ?? null });
        return null;
      }
    },
  }));
}
