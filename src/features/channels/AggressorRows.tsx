// The aggressors of an upload: rows for pairs of the victim's multi-port file, files of their own and
// coupling models, each NEXT or FEXT with an optional name.
import type { AggressorRow, CsvKind } from "./uploadStore";
import { MAX_CHANNEL_AGGRESSORS } from "./aggressors";

interface Props {
  rows: AggressorRow[];
  /** The victim file's port count when it is a multi-port file (pairs can then be chosen), else 0. */
  multiPorts: number;
  disabled: boolean;
  onAdd(source: AggressorRow["source"]): void;
  onChange(id: number, patch: Partial<AggressorRow>): void;
  onRemove(id: number): void;
}

const sourceLabels: Record<AggressorRow["source"], string> = {
  ports: "Pair of this file",
  file: "Its own file",
  coupling: "Coupling model",
};

export default function AggressorRows({ rows, multiPorts, disabled, onAdd, onChange, onRemove }: Props) {
  const full = rows.length >= MAX_CHANNEL_AGGRESSORS;
  return (
    <fieldset className="flex flex-col gap-3" aria-label="Aggressors">
      <legend className="mb-1 text-sm font-medium text-ink-soft">
        Aggressors (optional): neighbouring lanes that couple into this one
      </legend>
      {rows.map((r, i) => (
        <div
          key={r.id}
          className="flex flex-wrap items-end gap-3 rounded border border-line p-3"
          data-testid="aggressor-editor"
        >
          <span className="num self-center text-sm text-muted">{i + 1}</span>
          <label className="field">
            <span>Kind</span>
            <select
              className="input"
              aria-label={`Aggressor ${i + 1} kind`}
              value={r.kind}
              onChange={(e) => onChange(r.id, { kind: e.target.value as "next" | "fext" })}
            >
              <option value="next">NEXT (its transmitter beside this receiver)</option>
              <option value="fext">FEXT (its transmitter at the far end)</option>
            </select>
          </label>
          <label className="field">
            <span>Name</span>
            <input
              className="input"
              aria-label={`Aggressor ${i + 1} name`}
              value={r.name}
              placeholder={sourceLabels[r.source]}
              maxLength={200}
              onChange={(e) => onChange(r.id, { name: e.target.value })}
            />
          </label>
          {r.source === "ports" && (
            <>
              <label className="field w-20">
                <span>Port +</span>
                <input
                  className="input num"
                  type="number"
                  min={1}
                  max={multiPorts}
                  aria-label={`Aggressor ${i + 1} positive port`}
                  value={r.p}
                  onChange={(e) => onChange(r.id, { p: e.target.value })}
                />
              </label>
              <label className="field w-20">
                <span>Port −</span>
                <input
                  className="input num"
                  type="number"
                  min={1}
                  max={multiPorts}
                  aria-label={`Aggressor ${i + 1} negative port`}
                  value={r.n}
                  onChange={(e) => onChange(r.id, { n: e.target.value })}
                />
              </label>
            </>
          )}
          {r.source === "file" && (
            <>
              <label className="field">
                <span>File (.csv, .s2p, .s4p)</span>
                <input
                  type="file"
                  className="text-sm"
                  accept=".csv,.txt,.s2p,.s4p"
                  aria-label={`Aggressor ${i + 1} file`}
                  onChange={(e) => onChange(r.id, { file: e.target.files?.[0] ?? null })}
                />
              </label>
              {r.file && /\.(csv|txt)$/i.test(r.file.name) && (
                <label className="field">
                  <span>The CSV holds a…</span>
                  <select
                    className="input"
                    value={r.csvKind}
                    aria-label={`Aggressor ${i + 1} response`}
                    onChange={(e) => onChange(r.id, { csvKind: e.target.value as CsvKind })}
                  >
                    <option value="pulse-csv">Pulse response</option>
                    <option value="step-csv">Step response</option>
                    <option value="impulse-csv">Impulse response</option>
                  </select>
                </label>
              )}
            </>
          )}
          {r.source === "coupling" && (
            <>
              <label className="field w-32">
                <span>{r.kind === "next" ? "K_b (backward)" : "K_f·T_D (ps)"}</span>
                <input
                  className="input num"
                  inputMode="decimal"
                  aria-label={`Aggressor ${i + 1} coupling`}
                  value={r.coefficient}
                  onChange={(e) => onChange(r.id, { coefficient: e.target.value })}
                />
              </label>
              <label className="field w-28">
                <span>Line loss (dB)</span>
                <input
                  className="input num"
                  inputMode="decimal"
                  aria-label={`Aggressor ${i + 1} line loss`}
                  value={r.lineLoss_dB}
                  onChange={(e) => onChange(r.id, { lineLoss_dB: e.target.value })}
                />
              </label>
              <label className="field w-28">
                <span>Line delay (ns)</span>
                <input
                  className="input num"
                  inputMode="decimal"
                  aria-label={`Aggressor ${i + 1} line delay`}
                  value={r.lineDelay_ns}
                  onChange={(e) => onChange(r.id, { lineDelay_ns: e.target.value })}
                />
              </label>
            </>
          )}
          <button
            type="button"
            className="btn"
            disabled={disabled}
            onClick={() => onRemove(r.id)}
            aria-label={`Remove aggressor ${i + 1}`}
          >
            Remove
          </button>
        </div>
      ))}
      <div className="flex flex-wrap gap-2">
        {multiPorts >= 8 && (
          <button type="button" className="btn" disabled={disabled || full} onClick={() => onAdd("ports")}>
            + Pair of this file
          </button>
        )}
        <button type="button" className="btn" disabled={disabled || full} onClick={() => onAdd("file")}>
          + Aggressor file
        </button>
        <button type="button" className="btn" disabled={disabled || full} onClick={() => onAdd("coupling")}>
          + Coupling model
        </button>
      </div>
      <span className="help">
        NEXT comes from a transmitter next to this lane's receiver, FEXT from one at the far end, beside this lane's
        transmitter. The coupling model is the weak-coupling form: NEXT K_b·(1 − H²) over a coupled section, FEXT
        −j2πf·K_f·T_D·H along the line (H the line's loss and delay).
      </span>
    </fieldset>
  );
}
