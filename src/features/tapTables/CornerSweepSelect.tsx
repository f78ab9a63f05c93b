// The choice of corners a tap table version's defaults must hold at: none (the nominal budget), or
// the corners of a sweep, listed so that people see what they take.
import type { Corner } from "@lib/contract/corner";

/** A sweep whose corners a version can take. */
export interface SweepChoice {
  id: number;
  name: string;
  corners: Corner[];
}

interface Props {
  sweeps: SweepChoice[];
  value: number | null;
  onChange(id: number | null): void;
}

export default function CornerSweepSelect(props: Props) {
  const chosen = props.sweeps.find((s) => s.id === props.value);
  return (
    <div className="flex flex-col gap-1">
      <label className="field">
        <span>Corners</span>
        <select
          className="input max-w-96"
          value={props.value ?? ""}
          onChange={(e) => props.onChange(e.target.value === "" ? null : Number(e.target.value))}
        >
          <option value="">None: nominal values only</option>
          {props.sweeps.map((s) => (
            <option key={s.id} value={s.id}>
              The corners of “{s.name}” ({s.corners.length})
            </option>
          ))}
        </select>
      </label>
      <p className="help">
        {chosen
          ? `Each class default maximizes the worst headroom over its channels at every corner: ${chosen.corners.map((c) => c.name).join(", ")}.`
          : "Take a sweep's corners to make each class default hold at the worst corner, not only at nominal."}
      </p>
    </div>
  );
}
