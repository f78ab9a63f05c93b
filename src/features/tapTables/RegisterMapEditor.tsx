// The register map as an editable table: per field its name, bit width, signedness, LSB and range
// (the parameter and unit follow from the architecture). Inputs commit on every valid keystroke.
import { unitLabels, type RegisterField } from "./registerMap";

interface Props {
  fields: RegisterField[];
  onChange?: (fields: RegisterField[]) => void;
  /** Changes when the fields are replaced from outside, so that the inputs show the new values. */
  resetKey?: string | number;
}

function NumberCell(props: {
  label: string;
  value: number;
  onCommit: (v: number) => void;
  step?: string;
  readOnly: boolean;
  integer?: boolean;
}) {
  if (props.readOnly) return <span className="num">{props.value}</span>;
  return (
    <input
      className="input num w-24 px-1.5 py-0.5 text-xs"
      type="number"
      step={props.step ?? "any"}
      aria-label={props.label}
      defaultValue={props.value}
      onChange={(e) => {
        const v = Number(e.target.value);
        if (e.target.value !== "" && Number.isFinite(v) && (!props.integer || Number.isInteger(v))) props.onCommit(v);
      }}
    />
  );
}

export default function RegisterMapEditor(props: Props) {
  const readOnly = !props.onChange;
  const set = (i: number, patch: Partial<RegisterField>) =>
    props.onChange?.(props.fields.map((f, j) => (j === i ? { ...f, ...patch } : f)));
  return (
    <div className="overflow-x-auto">
      <table className="table" aria-label="Register map" data-testid="register-map">
        <thead>
          <tr>
            <th>Field</th>
            <th>Holds</th>
            <th>Bits</th>
            <th>Signed</th>
            <th>LSB</th>
            <th>Min</th>
            <th>Max</th>
            <th>Unit</th>
          </tr>
        </thead>
        <tbody>
          {props.fields.map((f, i) => (
            <tr key={`${props.resetKey ?? ""}-${f.parameter}`}>
              <td>
                {readOnly ? (
                  <code>{f.name}</code>
                ) : (
                  <input
                    className="input num w-32 px-1.5 py-0.5 text-xs"
                    aria-label={`Name of ${f.parameter}`}
                    defaultValue={f.name}
                    onChange={(e) => set(i, { name: e.target.value.trim() })}
                  />
                )}
              </td>
              <td>
                <code className="text-xs text-ink-soft">{f.parameter}</code>
              </td>
              <td>
                <NumberCell
                  label={`Bits of ${f.name}`}
                  value={f.bits}
                  step="1"
                  integer
                  readOnly={readOnly}
                  onCommit={(bits) => set(i, { bits })}
                />
              </td>
              <td>
                {readOnly ? (
                  f.signed ? (
                    "signed"
                  ) : (
                    "unsigned"
                  )
                ) : (
                  <input
                    type="checkbox"
                    aria-label={`${f.name} is signed`}
                    defaultChecked={f.signed}
                    onChange={(e) => set(i, { signed: e.target.checked })}
                  />
                )}
              </td>
              <td>
                <NumberCell
                  label={`LSB of ${f.name}`}
                  value={f.lsb}
                  readOnly={readOnly}
                  onCommit={(lsb) => set(i, { lsb })}
                />
              </td>
              <td>
                <NumberCell
                  label={`Min of ${f.name}`}
                  value={f.min}
                  readOnly={readOnly}
                  onCommit={(min) => set(i, { min })}
                />
              </td>
              <td>
                <NumberCell
                  label={`Max of ${f.name}`}
                  value={f.max}
                  readOnly={readOnly}
                  onCommit={(max) => set(i, { max })}
                />
              </td>
              <td className="text-xs text-muted">{unitLabels[f.unit]}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
