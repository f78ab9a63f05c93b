// State of the channel list island: filters, sort, the loaded pages. One store per island instance
// (created from the server-rendered first page), so server renders never share state.
import { createStore } from "zustand/vanilla";
import { api } from "@/components/api";
import type { ChannelListItem, SortKey } from "./channels";

export interface ChannelFilter {
  q: string;
  kind: string;
  program: string;
}

export interface ChannelListState {
  items: ChannelListItem[];
  nextCursor: string | null;
  filter: ChannelFilter;
  sort: SortKey;
  dir: "asc" | "desc";
  loading: boolean;
  error: string | null;
  setFilter(patch: Partial<ChannelFilter>): void;
  /** Sorts by `key`; a second click on the same key reverses the direction. */
  sortBy(key: SortKey): void;
  reload(): Promise<void>;
  loadMore(): Promise<void>;
}

const PAGE = 50;

export function createChannelListStore(initial: { items: ChannelListItem[]; nextCursor: string | null }) {
  return createStore<ChannelListState>()((set, get) => {
    let seq = 0;
    async function fetchPage(cursor: string | null) {
      const { filter, sort, dir } = get();
      const q = new URLSearchParams({ limit: String(PAGE), sort, dir });
      if (filter.q) q.set("q", filter.q);
      if (filter.kind) q.set("kind", filter.kind);
      if (filter.program) q.set("program", filter.program);
      if (cursor) q.set("cursor", cursor);
      const mine = ++seq;
      set({ loading: true, error: null });
      try {
        const r = await api<{ items: ChannelListItem[]; nextCursor: string | null }>(`/api/v1/channels?${q}`);
        if (mine !== seq) return;
        set((s) => ({ items: cursor ? [...s.items, ...r.items] : r.items, nextCursor: r.nextCursor, loading: false }));
      } catch (e) {
        if (mine === seq) set({ loading: false, error: (e as Error).message });
      }
    }
    return {
      items: initial.items,
      nextCursor: initial.nextCursor,
      filter: { q: "", kind: "", program: "" },
      sort: "createdAt",
      dir: "desc",
      loading: false,
      error: null,
      setFilter(patch) {
        set((s) => ({ filter: { ...s.filter, ...patch } }));
        void get().reload();
      },
      sortBy(key) {
        const s = get();
        set({
          sort: key,
          dir:
            s.sort === key
              ? s.dir === "asc"
                ? "desc"
                : "asc"
              : key === "name" || key === "kind" || key === "createdBy"
                ? "asc"
                : "desc",
        });
        void get().reload();
      },
      reload: () => fetchPage(null),
      loadMore: async () => {
        const c = get().nextCursor;
        if (c) await fetchPage(c);
      },
    };
  });
}
