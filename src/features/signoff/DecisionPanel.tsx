// The reviewer's decision: approve (the version is frozen) or send back with the reason.
import { useState } from "react";
import { api } from "@/components/api";
import { useSubmit } from "@/components/useSubmit";

interface Props {
  signOffId: number;
  version: number;
  failing: number;
}

export default function DecisionPanel(props: Props) {
  const [comment, setComment] = useState("");
  const { busy, error, submit } = useSubmit();

  const decide = (decision: "approve" | "reject") =>
    submit(async () => {
      await api(`/api/v1/sign-offs/${props.signOffId}/decision`, { method: "POST", json: { decision, comment } });
      location.reload();
    });

  return (
    <form className="flex flex-col gap-3" aria-label="Decision" onSubmit={(e) => e.preventDefault()}>
      {props.failing > 0 && (
        <p className="notice notice-warn">
          {props.failing} channel{props.failing === 1 ? " is" : "s are"} short of the required headroom with its class
          default.
        </p>
      )}
      <label className="field">
        <span>Comment (required when sending back)</span>
        <textarea
          className="input min-h-20"
          value={comment}
          onChange={(e) => setComment(e.target.value)}
          maxLength={4000}
          placeholder="What you checked, or what must change…"
        />
      </label>
      {error && (
        <p className="notice notice-bad" role="alert">
          {error}
        </p>
      )}
      <div className="flex flex-wrap gap-2">
        <button className="btn btn-primary" type="button" disabled={busy} onClick={() => decide("approve")}>
          Approve and freeze v{props.version}
        </button>
        <button className="btn btn-danger" type="button" disabled={busy} onClick={() => decide("reject")}>
          Send back
        </button>
      </div>
    </form>
  );
}
