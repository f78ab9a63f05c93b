// State of the new-study form: the budget, the channels, the candidates (the budget's usual ones,
// each on or off) and sending. One store per island instance.
import { createStore } from "zustand/vanilla";
import { api } from "@/components/api";
import type { Architecture } from "./architecture";
import type { Modulation } from "@lib/types";

export interface StudyBudgetChoice {
  id: number;
  name: string;
  modulation: Modulation;
  bitRate_bps: number | null;
  /** The usual candidates under this budget (its transmit FIR, DFE up to its tap count). */
  candidates: Architecture[];
}

export interface StudyChannelChoice {
  id: number;
  name: string;
  bitRate_bps: number;
  modulation: Modulation;
  lossAtNyquist_dB: number | null;
}

export interface NewStudyState {
  name: string;
  budgetId: number;
  channelIds: number[];
  /** Keys of the candidates left out. */
  off: string[];
  busy: boolean;
  error: string | null;
  setName(name: string): void;
  setBudget(id: number): void;
  toggleChannel(id: number): void;
  setChannels(ids: number[]): void;
  toggleCandidate(key: string): void;
  /** Starts the study; resolves to its id, or null when refused (error set). */
  submit(): Promise<number | null>;
}

export function createNewStudyStore(budgets: StudyBudgetChoice[], initialChannels: number[]) {
  return createStore<NewStudyState>()((set, get) => ({
    name: "",
    budgetId: budgets[0]?.id ?? 0,
    channelIds: initialChannels,
    off: [],
    busy: false,
    error: null,
    setName: (name) => set({ name }),
    setBudget: (budgetId) => set({ budgetId, off: [] }),
    toggleChannel: (id) =>
      set((s) => ({
        channelIds: s.channelIds.includes(id) ? s.channelIds.filter((x) => x !== id) : [...s.channelIds, id],
      })),
    setChannels: (channelIds) => set({ channelIds }),
    toggleCandidate: (key) =>
      set((s) => ({ off: s.off.includes(key) ? s.off.filter((k) => k !== key) : [...s.off, key] })),
    async submit() {
      const s = get();
      const budget = budgets.find((b) => b.id === s.budgetId);
      const candidates = budget?.candidates.filter((c) => !s.off.includes(c.key)) ?? [];
      set({ busy: true, error: null });
      try {
        const r = await api<{ id: number }>("/api/v1/studies", {
          method: "POST",
          json: {
            ...(s.name.trim() ? { name: s.name.trim() } : {}),
            budgetId: s.budgetId,
            channelIds: s.channelIds,
            candidates,
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
