// Record (or revise) the architecture a study chose and why; the page reloads to show the record.
import { useState } from "react";
import { api } from "@/components/api";
import { useSubmit } from "@/components/useSubmit";

interface Props {
  studyId: number;
  candidates: { key: string; label: string }[];
  current: { candidateKey: string; rationale: string } | null;
}

export default function DecisionForm(props: Props) {
  const [candidateKey, setKey] = useState(props.current?.candidateKey ?? props.candidates[0]?.key ?? "");
  const [rationale, setRationale] = useState(props.current?.rationale ?? "");
  const { busy, error, submit } = useSubmit();

  function record(e: React.SubmitEvent<HTMLFormElement>) {
    e.preventDefault();
    void submit(async () => {
      await api(`/api/v1/studies/${props.studyId}/decision`, { method: "PUT", json: { candidateKey, rationale } });
      location.reload();
    });
  }

  return (
    <form onSubmit={record} aria-label="Record the decision" className="flex flex-col gap-3">
      <label className="field">
        <span>Chosen architecture</span>
        <select className="input max-w-md" value={candidateKey} onChange={(e) => setKey(e.target.value)}>
          {props.candidates.map((c) => (
            <option key={c.key} value={c.key}>
              {c.label}
            </option>
          ))}
        </select>
      </label>
      <label className="field">
        <span>Rationale</span>
        <textarea
          className="input min-h-24"
          value={rationale}
          onChange={(e) => setRationale(e.target.value)}
          maxLength={4000}
          placeholder="Why this architecture: the headroom it leaves on the worst channel, what more taps would buy, power and area…"
        />
        <span className="help">Reviewers read this beside every tap table built on the study.</span>
      </label>
      {error && (
        <p className="notice notice-bad" role="alert">
          {error}
        </p>
      )}
      <div>
        <button className="btn btn-primary" type="submit" disabled={busy}>
          {busy ? "Saving…" : props.current ? "Revise the decision" : "Record the decision"}
        </button>
      </div>
    </form>
  );
}
