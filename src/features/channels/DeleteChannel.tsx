// Deleting a channel asks first; when tuning runs used it, it says that they keep their copy.
import { useState } from "react";
import { api } from "@/components/api";
import { useSubmit } from "@/components/useSubmit";

export default function DeleteChannel(props: { id: number; name: string; runCount: number }) {
  const [asking, setAsking] = useState(false);
  const { busy, error, submit } = useSubmit();

  const remove = () =>
    submit(async () => {
      await api(`/api/v1/channels/${props.id}?confirm=true`, { method: "DELETE" });
      location.href = "/channels";
    });

  if (!asking) {
    return (
      <button type="button" className="btn btn-danger" onClick={() => setAsking(true)}>
        Delete channel
      </button>
    );
  }
  return (
    <div className="notice notice-warn max-w-md" role="alertdialog" aria-label="Confirm deletion">
      <p>
        Delete <strong>{props.name}</strong> and its original file?
        {props.runCount > 0
          ? ` ${props.runCount} tuning run${props.runCount === 1 ? " uses" : "s use"} it; they keep their own copy of its pulse and stay readable.`
          : " No tuning run uses it."}
      </p>
      {error && <p className="mt-2 text-bad">{error}</p>}
      <div className="mt-2 flex gap-2">
        <button type="button" className="btn btn-danger" disabled={busy} onClick={remove}>
          Yes, delete
        </button>
        <button type="button" className="btn" onClick={() => setAsking(false)}>
          Keep it
        </button>
      </div>
    </div>
  );
}
