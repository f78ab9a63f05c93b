// State of the tap-table builder: name, budget, architecture (a study's decision or by hand),
// channels and their classes (loss bins or by hand), the register map, and sending.
import { createStore } from "zustand/vanilla";
import { api } from "@/components/api";
import { describeArchitecture, type Architecture } from "@/features/studies/architecture";
import type { BudgetForMap, RegisterField } from "./registerMap";
import type { Grouping } from "./tapTables";
import type { Modulation } from "@lib/types";

export interface TapTableBudgetChoice {
  id: number;
  name: string;
  modulation: Modulation;
  bitRate_bps: number | null;
  params: BudgetForMap;
}

export interface TapTableChannelChoice {
  id: number;
  name: string;
  bitRate_bps: number;
  modulation: Modulation;
  lossAtNyquist_dB: number | null;
}

export interface DecidedStudy {
  id: number;
  name: string;
  budgetId: number;
  channelIds: number[];
  architecture: Architecture;
  rationale: string;
}

/** The blocks of an architecture picked by hand (tap tables always hold the budget's CTLE). */
export interface ManualArchitecture {
  tx: { pre: number; post: number } | null;
  dfeTaps: number;
  /** Receive FFE tap counts (omitted or null: none). */
  ffe?: { pre: number; post: number } | null;
}

export interface NewTapTableState {
  name: string;
  description: string;
  note: string;
  budgetId: number;
  source: "study" | "manual";
  studyId: number | null;
  manual: ManualArchitecture;
  channelIds: number[];
  mode: Grouping["mode"];
  edgesText: string;
  /** Class name per channel id (manual grouping). */
  assignment: Record<number, string>;
  /** The register map as edited; null while it follows the architecture's default. */
  customMap: RegisterField[] | null;
  mapKey: number;
  /** The sweep whose corners the defaults must hold at, or null. */
  sweepId: number | null;
  busy: boolean;
  error: string | null;
  set(patch: Partial<Pick<NewTapTableState, "name" | "description" | "note" | "edgesText" | "mode">>): void;
  setBudget(id: number): void;
  useStudy(id: number | null): void;
  setManual(patch: Partial<ManualArchitecture>): void;
  toggleChannel(id: number): void;
  setChannels(ids: number[]): void;
  assign(id: number, className: string): void;
  editMap(fields: RegisterField[]): void;
  resetMap(): void;
  setSweep(id: number | null): void;
  submit(): Promise<number | null>;
}

/** Key and label of an architecture picked by hand: "tx1-1-ctle-ffe1-3-dfe2", "TX FIR 1 pre / 1 post · CTLE · RX FFE 1 pre / 3 post · DFE 2 taps". */
export function manualArchitecture(m: ManualArchitecture): Architecture {
  const parts: string[] = [];
  if (m.tx) parts.push(`tx${m.tx.pre}-${m.tx.post}`);
  parts.push("ctle");
  const ffe = m.ffe ?? null;
  if (ffe) parts.push(`ffe${ffe.pre}-${ffe.post}`);
  if (m.dfeTaps > 0) parts.push(`dfe${m.dfeTaps}`);
  const a = { key: parts.join("-"), label: "", tx: m.tx, ctle: true, dfeTaps: m.dfeTaps, ffe };
  return { ...a, label: describeArchitecture(a) };
}

/** The edges typed as "12, 20, 28" (null when a value is not a number). */
export function parseEdges(text: string): number[] | null {
  const parts = text.split(/[\s,;]+/).filter(Boolean);
  const values = parts.map(Number);
  return values.every(Number.isFinite) ? values : null;
}

/** The transmit FIR of a budget (1 pre / 1 post when it has none). */
function txOf(b: TapTableBudgetChoice | undefined): { pre: number; post: number } {
  const pre = b?.params.tx?.pre ?? 1;
  const post = b?.params.tx?.post ?? 1;
  return pre + post > 0 ? { pre, post } : { pre: 1, post: 1 };
}

export function createNewTapTableStore(init: {
  budgets: TapTableBudgetChoice[];
  studies: DecidedStudy[];
  channels: TapTableChannelChoice[];
}) {
  const firstStudy = init.studies[0];
  return createStore<NewTapTableState>()((set, get) => ({
    name: "",
    description: "",
    note: "",
    budgetId: firstStudy?.budgetId ?? init.budgets[0]?.id ?? 0,
    source: firstStudy ? "study" : "manual",
    studyId: firstStudy?.id ?? null,
    manual: { tx: txOf(init.budgets[0]), dfeTaps: init.budgets[0]?.params.dfe?.taps ?? 0 },
    channelIds: firstStudy?.channelIds ?? [],
    mode: "loss-bins",
    edgesText: "12, 20, 28",
    assignment: {},
    customMap: null,
    mapKey: 0,
    sweepId: null,
    busy: false,
    error: null,
    set: (patch) => set(patch),
    setBudget: (budgetId) =>
      set((s) => {
        const b = init.budgets.find((x) => x.id === budgetId);
        return {
          budgetId,
          manual: { tx: txOf(b), dfeTaps: b?.params.dfe?.taps ?? 0 },
          customMap: null,
          mapKey: s.mapKey + 1,
        };
      }),
    useStudy: (id) =>
      set((s) => {
        const study = init.studies.find((x) => x.id === id);
        if (!study) return { source: "manual", studyId: null, customMap: null, mapKey: s.mapKey + 1 };
        return {
          source: "study",
          studyId: study.id,
          budgetId: study.budgetId,
          channelIds: study.channelIds,
          customMap: null,
          mapKey: s.mapKey + 1,
        };
      }),
    setManual: (patch) => set((s) => ({ manual: { ...s.manual, ...patch }, customMap: null, mapKey: s.mapKey + 1 })),
    toggleChannel: (id) =>
      set((s) => ({
        channelIds: s.channelIds.includes(id) ? s.channelIds.filter((x) => x !== id) : [...s.channelIds, id],
      })),
    setChannels: (channelIds) => set({ channelIds }),
    assign: (id, className) => set((s) => ({ assignment: { ...s.assignment, [id]: className } })),
    editMap: (fields) => set({ customMap: fields }),
    resetMap: () => set((s) => ({ customMap: null, mapKey: s.mapKey + 1 })),
    setSweep: (sweepId) => set({ sweepId }),
    async submit() {
      const s = get();
      const grouping = groupingOf(s);
      if (typeof grouping === "string") {
        set({ error: grouping });
        return null;
      }
      const arch = architectureOf(s, init.studies);
      set({ busy: true, error: null });
      try {
        const r = await api<{ id: number }>("/api/v1/tap-tables", {
          method: "POST",
          json: {
            name: s.name,
            ...(s.description.trim() ? { description: s.description.trim() } : {}),
            ...(s.note.trim() ? { note: s.note.trim() } : {}),
            budgetId: s.budgetId,
            ...(s.source === "study" && s.studyId ? { studyId: s.studyId } : { architecture: arch }),
            ...(s.customMap ? { registerMap: s.customMap } : {}),
            ...(s.sweepId !== null ? { sweepId: s.sweepId } : {}),
            grouping,
          },
        });
        return r.id;
      } catch (e) {
        set({ busy: false, error: (e as Error).message });
        return null;
      }
    },
  }));
}

/** The architecture the builder currently stands for. */
export function architectureOf(
  s: Pick<NewTapTableState, "source" | "studyId" | "manual">,
  studies: DecidedStudy[],
): Architecture | null {
  if (s.source === "study") return studies.find((x) => x.id === s.studyId)?.architecture ?? null;
  return manualArchitecture(s.manual);
}

/** The grouping request, or a sentence saying what is missing. */
export function groupingOf(
  s: Pick<NewTapTableState, "mode" | "edgesText" | "channelIds" | "assignment">,
): Grouping | string {
  if (s.channelIds.length === 0) return "Choose at least one channel.";
  if (s.mode === "loss-bins") {
    const edges = parseEdges(s.edgesText);
    if (!edges) return "Give the bin edges as numbers of dB, e.g. 12, 20, 28.";
    return { mode: "loss-bins", edges_dB: edges, channelIds: s.channelIds };
  }
  const byClass = new Map<string, number[]>();
  for (const id of s.channelIds) {
    const name = (s.assignment[id] ?? "").trim() || "Class A";
    byClass.set(name, [...(byClass.get(name) ?? []), id]);
  }
  return { mode: "manual", classes: [...byClass].map(([name, channelIds]) => ({ name, channelIds })) };
}
