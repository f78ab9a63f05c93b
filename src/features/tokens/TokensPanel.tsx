// API tokens: a person's own (create one — the secret is shown once —, see when each was used,
// revoke), or for admins with `all`, everyone's, to revoke.
import { useState } from "react";
import { api } from "@/components/api";
import { formatWhen } from "@/components/format";

interface Token {
  id: number;
  name: string;
  prefix: string;
  createdAt: string | Date;
  lastUsedAt: string | Date | null;
  revokedAt: string | Date | null;
  owner?: { id: string; email: string };
}

export default function TokensPanel(props: { tokens: Token[]; all?: boolean }) {
  const [tokens, setTokens] = useState(props.tokens);
  const [secret, setSecret] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);

  async function reload() {
    setTokens((await api<{ items: Token[] }>(props.all ? "/api/v1/tokens?all=1" : "/api/v1/tokens")).items);
  }
  async function create(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = event.currentTarget;
    setError(null);
    try {
      const r = await api<{ secret: string }>("/api/v1/tokens", {
        method: "POST",
        json: { name: new FormData(form).get("name") },
      });
      setSecret(r.secret);
      form.reset();
      await reload();
    } catch (e) {
      setError((e as Error).message);
    }
  }
  async function revoke(t: Token) {
    if (!confirm(`Revoke “${t.name}”? Scripts using it stop working at once.`)) return;
    try {
      await api(`/api/v1/tokens/${t.id}`, { method: "DELETE" });
      await reload();
    } catch (e) {
      setError((e as Error).message);
    }
  }

  return (
    <section className="card">
      <h2>{props.all ? "Everyone's API tokens" : "API tokens"}</h2>
      <p className="help mt-1">
        For build scripts: <code>Authorization: Bearer &lt;token&gt;</code> reads the workspace and exports tap tables.
        Tokens cannot change anything.
      </p>
      {!props.all && (
        <form className="mt-3 flex items-end gap-3" onSubmit={create}>
          <label className="field">
            <span>Name</span>
            <input className="input w-72" name="name" placeholder="firmware build server" required />
          </label>
          <button className="btn btn-primary" type="submit">
            Create token
          </button>
        </form>
      )}
      {secret && (
        <div className="notice notice-warn mt-3" role="status">
          Copy this token now; it is not shown again:{" "}
          <code className="break-all" data-testid="token-secret">
            {secret}
          </code>
        </div>
      )}
      {error && <p className="notice notice-bad mt-3">{error}</p>}
      <table className="table mt-4">
        <thead>
          <tr>
            {props.all && <th>Owner</th>}
            <th>Name</th>
            <th>Starts with</th>
            <th>Created</th>
            <th>Last used</th>
            <th />
          </tr>
        </thead>
        <tbody>
          {tokens.map((t) => (
            <tr key={t.id} className={t.revokedAt ? "text-muted" : ""}>
              {props.all && <td>{t.owner?.email}</td>}
              <td>{t.name}</td>
              <td>
                <code>tw_{t.prefix}_…</code>
              </td>
              <td className="num">{formatWhen(t.createdAt)}</td>
              <td className="num">{t.lastUsedAt ? formatWhen(t.lastUsedAt) : "never"}</td>
              <td>
                {t.revokedAt ? (
                  `revoked ${formatWhen(t.revokedAt)}`
                ) : (
                  <button className="btn btn-danger" onClick={() => revoke(t)}>
                    Revoke
                  </button>
                )}
              </td>
            </tr>
          ))}
          {tokens.length === 0 && (
            <tr>
              <td colSpan={props.all ? 6 : 5} className="text-muted">
                No tokens yet.
              </td>
            </tr>
          )}
        </tbody>
      </table>
    </section>
  );
}
