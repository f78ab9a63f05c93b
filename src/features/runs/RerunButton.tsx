// "Run again": a new run from this run's own copy of its inputs, which must reproduce it.
import { api } from "@/components/api";
import { useSubmit } from "@/components/useSubmit";

export default function RerunButton(props: { id: number }) {
  const { busy, error, submit } = useSubmit();
  const again = () =>
    submit(async () => {
      const r = await api<{ id: number }>(`/api/v1/runs/${props.id}/rerun`, { method: "POST" });
      location.href = `/runs/${r.id}`;
    });
  return (
    <div className="flex flex-col items-end gap-1">
      <button
        type="button"
        className="btn"
        onClick={again}
        disabled={busy}
        title="Starts a new run from this run's own copy of the channel's pulse and the budget"
      >
        {busy ? "Starting…" : "Run again"}
      </button>
      {error && <span className="text-xs text-bad">{error}</span>}
    </div>
  );
}
