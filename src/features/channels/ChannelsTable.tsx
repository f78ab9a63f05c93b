// The channel list: filter by name, kind and program; sort by any column; load more pages.
import { useState } from "react";
import { useStore } from "zustand";
import { formatMillivolts, formatWhen } from "@/components/format";
import { createChannelListStore } from "./channelListStore";
import { formatBitRate, formatDb, kindLabels, type ChannelListItem, type SortKey } from "./channels";

interface Props {
  items: ChannelListItem[];
  nextCursor: string | null;
  programs: { id: number; name: string }[];
}

const columns: { key: SortKey; label: string; numeric?: boolean }[] = [
  { key: "name", label: "Name" },
  { key: "kind", label: "Kind" },
  { key: "bitRate", label: "Bit rate", numeric: true },
  { key: "loss", label: "Loss at Nyquist", numeric: true },
  { key: "mainCursor", label: "Main cursor (1 V)", numeric: true },
  { key: "createdBy", label: "Added by" },
  { key: "createdAt", label: "When" },
];

export default function ChannelsTable(props: Props) {
  const [store] = useState(() => createChannelListStore(props));
  const s = useStore(store);
  const [q, setQ] = useState("");

  return (
    <section className="card" aria-label="Channels">
      <form
        className="flex flex-wrap items-end gap-3"
        role="search"
        onSubmit={(e) => {
          e.preventDefault();
          s.setFilter({ q });
        }}
      >
        <label className="field">
          <span>Name contains</span>
          <input
            className="input w-56"
            value={q}
            onChange={(e) => setQ(e.target.value)}
            onBlur={() => q !== s.filter.q && s.setFilter({ q })}
            placeholder="e.g. slot 7"
          />
        </label>
        <label className="field">
          <span>Kind</span>
          <select className="input" value={s.filter.kind} onChange={(e) => s.setFilter({ kind: e.target.value })}>
            <option value="">All kinds</option>
            {Object.entries(kindLabels).map(([k, label]) => (
              <option key={k} value={k}>
                {label}
              </option>
            ))}
          </select>
        </label>
        {props.programs.length > 1 && (
          <label className="field">
            <span>Program</span>
            <select
              className="input"
              value={s.filter.program}
              onChange={(e) => s.setFilter({ program: e.target.value })}
            >
              <option value="">All programs</option>
              {props.programs.map((p) => (
                <option key={p.id} value={p.id}>
                  {p.name}
                </option>
              ))}
            </select>
          </label>
        )}
        <button className="btn" type="submit">
          Filter
        </button>
        {s.loading && (
          <span className="text-xs text-muted" role="status">
            Loading…
          </span>
        )}
      </form>
      {s.error && <p className="notice notice-bad mt-3">{s.error}</p>}
      <div className="mt-4 overflow-x-auto">
        <table className="table" data-testid="channel-table">
          <thead>
            <tr>
              {columns.map((c) => (
                <th
                  key={c.key}
                  aria-sort={s.sort === c.key ? (s.dir === "asc" ? "ascending" : "descending") : "none"}
                  style={c.numeric ? { textAlign: "right" } : undefined}
                >
                  <button type="button" className="uppercase hover:text-ink" onClick={() => s.sortBy(c.key)}>
                    {c.label}
                    <span aria-hidden className="ml-1 text-accent">
                      {s.sort === c.key ? (s.dir === "asc" ? "▲" : "▼") : ""}
                    </span>
                  </button>
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {s.items.map((c) => (
              <tr key={c.id}>
                <td>
                  <a href={`/channels/${c.id}`} className="font-medium">
                    {c.name}
                  </a>
                  {props.programs.length > 1 && <div className="text-xs text-muted">{c.program}</div>}
                </td>
                <td className="whitespace-nowrap">{kindLabels[c.kind]}</td>
                <td className="num whitespace-nowrap text-right">
                  {formatBitRate(c.bitRate_bps)}{" "}
                  <span className="text-xs text-muted">{c.modulation.toUpperCase()}</span>
                </td>
                <td className="num text-right">{formatDb(c.lossAtNyquist_dB)}</td>
                <td className="num text-right">{formatMillivolts(c.mainCursor_V)}</td>
                <td>{c.createdBy ?? "—"}</td>
                <td className="num whitespace-nowrap">{formatWhen(c.createdAt)}</td>
              </tr>
            ))}
            {s.items.length === 0 && (
              <tr>
                <td colSpan={columns.length} className="text-muted">
                  No channels match.
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>
      {s.nextCursor && (
        <button className="btn mt-3" onClick={() => void s.loadMore()} disabled={s.loading}>
          More channels
        </button>
      )}
    </section>
  );
}
