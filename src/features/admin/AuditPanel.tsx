// Admin: the audit trail with filters (action prefix, person, kind of thing, date range) and paging.
import { useEffect, useState } from "react";
import { api } from "@/components/api";
import { formatWhen } from "@/components/format";

interface Event {
  id: number;
  actorEmail: string | null;
  action: string;
  targetType: string | null;
  targetId: string | null;
  detail: Record<string, unknown> | null;
  createdAt: string;
}

export default function AuditPanel() {
  const [filter, setFilter] = useState({ action: "", actor: "", targetType: "", from: "", to: "" });
  const [items, setItems] = useState<Event[]>([]);
  const [cursor, setCursor] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);

  async function load(append: string | null) {
    const q = new URLSearchParams({ limit: "50" });
    for (const [k, v] of Object.entries(filter)) if (v) q.set(k, v);
    if (append) q.set("cursor", append);
    try {
      const r = await api<{ items: Event[]; nextCursor: string | null }>(`/api/v1/audit?${q}`);
      setItems((prev) => (append ? [...prev, ...r.items] : r.items));
      setCursor(r.nextCursor);
      setError(null);
    } catch (e) {
      setError((e as Error).message);
    }
  }
  // The first page loads once, with the empty filter; later loads follow the Filter button and "Older events".
  // eslint-disable-next-line react-hooks/exhaustive-deps -- on mount only, by design
  useEffect(() => void load(null), []);

  const set = (k: keyof typeof filter) => (e: React.ChangeEvent<HTMLInputElement>) =>
    setFilter({ ...filter, [k]: e.target.value });
  return (
    <section className="card">
      <h2>Audit trail</h2>
      <form
        className="mt-3 flex flex-wrap items-end gap-3"
        onSubmit={(e) => {
          e.preventDefault();
          void load(null);
        }}
      >
        <label className="field">
          <span>Action starts with</span>
          <input className="input w-40" value={filter.action} onChange={set("action")} placeholder="channel." />
        </label>
        <label className="field">
          <span>Person (e-mail)</span>
          <input className="input w-56" value={filter.actor} onChange={set("actor")} />
        </label>
        <label className="field">
          <span>Kind</span>
          <input className="input w-32" value={filter.targetType} onChange={set("targetType")} placeholder="run" />
        </label>
        <label className="field">
          <span>From</span>
          <input className="input" type="date" value={filter.from} onChange={set("from")} />
        </label>
        <label className="field">
          <span>To</span>
          <input className="input" type="date" value={filter.to} onChange={set("to")} />
        </label>
        <button className="btn" type="submit">
          Filter
        </button>
      </form>
      {error && <p className="notice notice-bad mt-3">{error}</p>}
      <table className="table mt-4">
        <thead>
          <tr>
            <th>When</th>
            <th>Who</th>
            <th>Action</th>
            <th>On</th>
            <th>Detail</th>
          </tr>
        </thead>
        <tbody>
          {items.map((e) => (
            <tr key={e.id}>
              <td className="num whitespace-nowrap">{formatWhen(e.createdAt)}</td>
              <td>{e.actorEmail ?? "—"}</td>
              <td>
                <code>{e.action}</code>
              </td>
              <td>{e.targetType ? `${e.targetType} ${e.targetId ?? ""}` : "—"}</td>
              <td className="max-w-md truncate text-xs text-muted" title={e.detail ? JSON.stringify(e.detail) : ""}>
                {e.detail ? JSON.stringify(e.detail) : ""}
              </td>
            </tr>
          ))}
          {items.length === 0 && (
            <tr>
              <td colSpan={5} className="text-muted">
                No events match.
              </td>
            </tr>
          )}
        </tbody>
      </table>
      {cursor && (
        <button className="btn mt-3" onClick={() => load(cursor)}>
          Older events
        </button>
      )}
    </section>
  );
}
