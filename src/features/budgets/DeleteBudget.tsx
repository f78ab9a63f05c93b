// Deleting a budget asks first; tuning runs that used it keep their own copy.
import { useState } from "react";
import { api } from "@/components/api";
import { useSubmit } from "@/components/useSubmit";

export default function DeleteBudget(props: { id: number; name: string; runCount: number }) {
  const [asking, setAsking] = useState(false);
  const { error, submit } = useSubmit();

  const remove = () =>
    submit(async () => {
      await api(`/api/v1/budgets/${props.id}`, { method: "DELETE" });
      location.href = "/budgets";
    });

  if (!asking) {
    return (
      <button type="button" className="btn btn-danger" onClick={() => setAsking(true)}>
        Delete budget
      </button>
    );
  }
  return (
    <div className="notice notice-warn max-w-md" role="alertdialog" aria-label="Confirm deletion">
      <p>
        Delete <strong>{props.name}</strong>?
        {props.runCount > 0
          ? ` ${props.runCount} tuning run${props.runCount === 1 ? " keeps" : "s keep"} its own copy.`
          : ""}
      </p>
      {error && <p className="mt-2 text-bad">{error}</p>}
      <div className="mt-2 flex gap-2">
        <button type="button" className="btn btn-danger" onClick={remove}>
          Yes, delete
        </button>
        <button type="button" className="btn" onClick={() => setAsking(false)}>
          Keep it
        </button>
      </div>
    </div>
  );
}
