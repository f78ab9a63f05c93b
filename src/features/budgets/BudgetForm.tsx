// The budget form: every field with its unit and help, starting points to begin from, validation
// with the engine's schema as you save (the server checks again with the same schema).
import { useState } from "react";
import { useStore } from "zustand";
import { createBudgetFormStore } from "./budgetFormStore";
import { budgetForm, type FieldSpec } from "./budgetForm";
import { budgetPresets } from "./budgetPresets";
import type { BudgetInput } from "@lib/contract/budget";

interface Props {
  id: number | null;
  name: string;
  description: string;
  budget: BudgetInput;
  /** Read-only for roles that may not edit budgets. */
  readOnly?: boolean;
}

function Field({
  spec,
  value,
  error,
  onChange,
  readOnly,
}: {
  spec: FieldSpec;
  value: string;
  error?: string;
  onChange: (v: string) => void;
  readOnly?: boolean;
}) {
  const id = `budget-${spec.path.replace(/\./g, "-")}`;
  const label = spec.unit ? `${spec.label} (${spec.unit})` : spec.label;
  return (
    <div className="field">
      <label htmlFor={id}>
        <span className="font-medium text-ink-soft">{label}</span>
      </label>
      {spec.kind === "select" ? (
        <select
          id={id}
          className="input"
          value={value}
          disabled={readOnly}
          onChange={(e) => onChange(e.target.value)}
          aria-invalid={!!error}
        >
          {spec.options!.map((o) => (
            <option key={o.value} value={o.value}>
              {o.label}
            </option>
          ))}
        </select>
      ) : (
        <input
          id={id}
          className={`input num ${error ? "border-bad" : ""}`}
          inputMode={spec.kind === "list" || spec.kind === "ber" ? "text" : "decimal"}
          value={value}
          placeholder={spec.placeholder}
          readOnly={readOnly}
          onChange={(e) => onChange(e.target.value)}
          aria-invalid={!!error}
          aria-describedby={`${id}-help`}
        />
      )}
      {error && (
        <span className="text-xs text-bad" role="alert">
          {error}
        </span>
      )}
      <span id={`${id}-help`} className="help">
        {spec.help}
      </span>
    </div>
  );
}

export default function BudgetForm(props: Props) {
  const [store] = useState(() =>
    createBudgetFormStore({ id: props.id, name: props.name, description: props.description, budget: props.budget }),
  );
  const s = useStore(store);

  async function submit(e: React.FormEvent) {
    e.preventDefault();
    const id = await s.save();
    if (id !== null && props.id === null) location.href = `/budgets/${id}?saved=1`;
  }

  return (
    <form className="flex flex-col gap-6" onSubmit={submit} aria-label="Budget" noValidate>
      {props.readOnly && <p className="notice notice-warn">Read only: designers and admins edit budgets.</p>}
      {!props.readOnly && props.id === null && (
        <section className="card" aria-label="Starting points">
          <h2>Start from</h2>
          <p className="help mt-1">Fills every field below; adjust them to your silicon.</p>
          <div className="mt-3 grid gap-3 md:grid-cols-3">
            {budgetPresets.map((p) => (
              <button
                key={p.key}
                type="button"
                className="rounded-lg border border-line p-3 text-left hover:border-accent hover:bg-accent-soft"
                onClick={() => s.applyPreset(p)}
              >
                <div className="font-medium">{p.name}</div>
                <div className="mt-1 text-xs text-ink-soft">{p.description}</div>
              </button>
            ))}
          </div>
        </section>
      )}
      <section className="card grid gap-4 md:grid-cols-[1fr_2fr]">
        <div className="field">
          <label htmlFor="budget-name">
            <span className="font-medium text-ink-soft">Name</span>
          </label>
          <input
            id="budget-name"
            className={`input ${s.errors.name ? "border-bad" : ""}`}
            value={s.name}
            readOnly={props.readOnly}
            onChange={(e) => s.setName(e.target.value)}
            aria-invalid={!!s.errors.name}
            maxLength={200}
          />
          {s.errors.name && (
            <span className="text-xs text-bad" role="alert">
              {s.errors.name}
            </span>
          )}
          <span className="help">Unique; runs show it.</span>
        </div>
        <div className="field">
          <label htmlFor="budget-description">
            <span className="font-medium text-ink-soft">Description</span>
          </label>
          <input
            id="budget-description"
            className="input"
            value={s.description}
            readOnly={props.readOnly}
            onChange={(e) => s.setDescription(e.target.value)}
            maxLength={2000}
          />
          <span className="help">What link this budget is for, and where its numbers come from.</span>
        </div>
      </section>
      {budgetForm.map((g) => (
        <fieldset key={g.title} className="card">
          <legend className="sr-only">{g.title}</legend>
          <h2>{g.title}</h2>
          {g.intro && <p className="help mt-1">{g.intro}</p>}
          <div className="mt-3 grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
            {g.fields.map((f) => (
              <Field
                key={f.path}
                spec={f}
                value={s.draft[f.path] ?? ""}
                error={s.errors[f.path] || undefined}
                onChange={(v) => s.setField(f.path, v)}
                readOnly={props.readOnly}
              />
            ))}
          </div>
        </fieldset>
      ))}
      {s.errors[""] && (
        <p className="notice notice-bad" role="alert">
          {s.errors[""]}
        </p>
      )}
      {Object.values(s.errors).some(Boolean) && !s.errors[""] && (
        <p className="notice notice-bad" role="alert">
          Some fields need attention; see the messages beside them.
        </p>
      )}
      {s.saved && (
        <p className="notice notice-good" role="status">
          {s.saved}
        </p>
      )}
      {!props.readOnly && (
        <div className="flex gap-3">
          <button className="btn btn-primary" type="submit" disabled={s.saving}>
            {s.saving ? "Saving…" : props.id === null ? "Create budget" : "Save changes"}
          </button>
        </div>
      )}
    </form>
  );
}
