// Ask a reviewer to sign off a tap table version (designers and admins); the reviewer is e-mailed.
import { useState } from "react";
import { api } from "@/components/api";
import { useSubmit } from "@/components/useSubmit";

interface Props {
  tableId: number;
  version: number;
  reviewers: { id: string; name: string; email: string; role: string }[];
  selfId: string;
}

export default function RequestSignOff(props: Props) {
  const choices = props.reviewers.filter((r) => r.id !== props.selfId);
  const [reviewerId, setReviewer] = useState(choices.find((r) => r.role === "reviewer")?.id ?? choices[0]?.id ?? "");
  const [message, setMessage] = useState("");
  const { busy, error, submit } = useSubmit();

  function request(e: React.SubmitEvent<HTMLFormElement>) {
    e.preventDefault();
    void submit(async () => {
      const r = await api<{ id: number }>(`/api/v1/tap-tables/${props.tableId}/versions/${props.version}/sign-off`, {
        method: "POST",
        json: { reviewerId, ...(message.trim() ? { message: message.trim() } : {}) },
      });
      location.href = `/sign-off/${r.id}`;
    });
  }

  if (choices.length === 0)
    return (
      <p className="text-sm text-muted">
        Nobody else can decide sign-offs yet; an admin can give someone the reviewer role.
      </p>
    );
  return (
    <form onSubmit={request} aria-label="Request sign-off" className="flex flex-col gap-3">
      <label className="field max-w-md">
        <span>Reviewer</span>
        <select className="input" value={reviewerId} onChange={(e) => setReviewer(e.target.value)}>
          {choices.map((r) => (
            <option key={r.id} value={r.id}>
              {r.name} ({r.role})
            </option>
          ))}
        </select>
      </label>
      <label className="field">
        <span>Message (optional)</span>
        <textarea
          className="input min-h-16"
          maxLength={2000}
          value={message}
          onChange={(e) => setMessage(e.target.value)}
          placeholder="What changed, what to look at first…"
        />
      </label>
      {error && (
        <p className="notice notice-bad" role="alert">
          {error}
        </p>
      )}
      <div>
        <button className="btn btn-primary" type="submit" disabled={busy || !reviewerId}>
          {busy ? "Sending…" : `Request sign-off of v${props.version}`}
        </button>
      </div>
    </form>
  );
}
