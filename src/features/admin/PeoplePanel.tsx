// Admin: everyone's role (changeable), offboarding (deactivate, end sessions), invitations by
// e-mail, and the open invitations (revocable).
import { useState } from "react";
import { api } from "@/components/api";
import { formatWhen } from "@/components/format";
import { roles, type Role } from "@/features/people/people";

interface Person {
  id: string;
  name: string;
  email: string;
  role: Role;
  deactivatedAt: string | Date | null;
  createdAt: string | Date;
}
interface Invitation {
  id: number;
  email: string;
  role: Role;
  expiresAt: string | Date;
}

export default function PeoplePanel(props: { people: Person[]; invitations: Invitation[]; selfId: string }) {
  const [people, setPeople] = useState(props.people);
  const [invitations, setInvitations] = useState(props.invitations);
  const [message, setMessage] = useState<{ kind: "good" | "bad"; text: string } | null>(null);
  const [link, setLink] = useState<string | null>(null);

  async function reload() {
    const r = await api<{ items: Person[]; invitations: Invitation[] }>("/api/v1/users");
    setPeople(r.items);
    setInvitations(r.invitations);
  }

  async function changeRole(person: Person, role: Role) {
    setMessage(null);
    try {
      await api(`/api/v1/users/${person.id}/role`, { method: "PUT", json: { role } });
      setMessage({ kind: "good", text: `${person.email} is now ${role}.` });
    } catch (e) {
      setMessage({ kind: "bad", text: (e as Error).message });
    }
    await reload();
  }

  /** One admin action on the API, its outcome shown above the tables, then the lists reloaded. */
  async function act(done: string, url: string, init: Parameters<typeof api>[1]) {
    setMessage(null);
    try {
      await api(url, init);
      setMessage({ kind: "good", text: done });
    } catch (e) {
      setMessage({ kind: "bad", text: (e as Error).message });
    }
    await reload();
  }

  async function invite(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = event.currentTarget;
    const data = new FormData(form);
    setMessage(null);
    setLink(null);
    try {
      const r = await api<{ email: string; link: string }>("/api/v1/invitations", {
        method: "POST",
        json: { email: data.get("email"), role: data.get("role") },
      });
      setMessage({ kind: "good", text: `Invitation e-mailed to ${r.email}.` });
      setLink(r.link);
      form.reset();
      await reload();
    } catch (e) {
      setMessage({ kind: "bad", text: (e as Error).message });
    }
  }

  return (
    <div className="flex flex-col gap-6">
      {message && (
        <p className={`notice ${message.kind === "good" ? "notice-good" : "notice-bad"}`} role="status">
          {message.text}
        </p>
      )}
      <section className="card">
        <h2>Invite a person</h2>
        <form className="mt-3 flex flex-wrap items-end gap-3" onSubmit={invite}>
          <label className="field">
            <span>E-mail</span>
            <input className="input w-72" type="email" name="email" required />
          </label>
          <label className="field">
            <span>Role</span>
            <select className="input" name="role" defaultValue="designer">
              {roles.map((r) => (
                <option key={r} value={r}>
                  {r}
                </option>
              ))}
            </select>
          </label>
          <button className="btn btn-primary" type="submit">
            Send invitation
          </button>
        </form>
        {link && (
          <p className="mt-3 text-sm text-ink-soft">
            Link (also in the e-mail): <code className="break-all">{link}</code>
          </p>
        )}
        {invitations.length > 0 && (
          <table className="table mt-4">
            <thead>
              <tr>
                <th>Invited</th>
                <th>Role</th>
                <th>Expires</th>
                <th></th>
              </tr>
            </thead>
            <tbody>
              {invitations.map((i) => (
                <tr key={i.id}>
                  <td>{i.email}</td>
                  <td>{i.role}</td>
                  <td className="num">{formatWhen(i.expiresAt)}</td>
                  <td>
                    <button
                      type="button"
                      className="btn py-1"
                      onClick={() =>
                        act(`The invitation of ${i.email} is revoked.`, `/api/v1/invitations/${i.id}`, {
                          method: "DELETE",
                        })
                      }
                    >
                      Revoke
                    </button>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
      <section className="card">
        <h2>People</h2>
        <table className="table mt-3">
          <thead>
            <tr>
              <th>Name</th>
              <th>E-mail</th>
              <th>Role</th>
              <th>Joined</th>
              <th>Access</th>
            </tr>
          </thead>
          <tbody>
            {people.map((p) => (
              <tr key={p.id}>
                <td>{p.name}</td>
                <td>{p.email}</td>
                <td>
                  <select
                    className="input py-1"
                    aria-label={`Role of ${p.email}`}
                    value={p.role}
                    onChange={(e) => changeRole(p, e.target.value as Role)}
                  >
                    {roles.map((r) => (
                      <option key={r} value={r}>
                        {r}
                      </option>
                    ))}
                  </select>
                  {p.id === props.selfId && <span className="ml-2 text-xs text-muted">(you)</span>}
                </td>
                <td className="num">{formatWhen(p.createdAt)}</td>
                <td>
                  {p.id !== props.selfId && (
                    <span className="flex gap-2">
                      {p.deactivatedAt ? (
                        <button
                          type="button"
                          className="btn py-1"
                          onClick={() =>
                            act(`${p.email} may sign in again.`, `/api/v1/users/${p.id}/active`, {
                              method: "PUT",
                              json: { active: true },
                            })
                          }
                        >
                          Reactivate
                        </button>
                      ) : (
                        <>
                          <button
                            type="button"
                            className="btn py-1"
                            onClick={() =>
                              act(
                                `${p.email} is deactivated; their sessions and API tokens have ended.`,
                                `/api/v1/users/${p.id}/active`,
                                { method: "PUT", json: { active: false } },
                              )
                            }
                          >
                            Deactivate
                          </button>
                          <button
                            type="button"
                            className="btn py-1"
                            onClick={() =>
                              act(`${p.email} is signed out everywhere.`, `/api/v1/users/${p.id}/sessions`, {
                                method: "DELETE",
                              })
                            }
                          >
                            End sessions
                          </button>
                        </>
                      )}
                    </span>
                  )}
                  {p.deactivatedAt && (
                    <span className="text-xs text-muted">deactivated {formatWhen(p.deactivatedAt)}</span>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
    </div>
  );
}
