// State of the budget form: the text of every field (display units), the name, errors by field,
// and saving. Validation uses the engine's own schema, exactly as the server does.
import { createStore } from "zustand/vanilla";
import { api, ApiCallError } from "@/components/api";
import { budgetRequest } from "./budgets";
import { budgetFromDraft, draftFromBudget, fieldForPath, type Draft } from "./budgetForm";
import type { BudgetPreset } from "./budgetPresets";
import type { BudgetInput } from "@lib/contract/budget";

export interface BudgetFormState {
  id: number | null;
  name: string;
  description: string;
  draft: Draft;
  /** Messages by field path ("name", "ctle.fz_Hz", …); "" holds a message for the whole form. */
  errors: Record<string, string>;
  saving: boolean;
  saved: string | null;
  setName(name: string): void;
  setDescription(text: string): void;
  setField(path: string, text: string): void;
  applyPreset(preset: BudgetPreset): void;
  /** Validates everything; returns the request body or null (errors set). */
  validate(): Record<string, unknown> | null;
  /** Saves; resolves to the budget's id, or null when it was refused. */
  save(): Promise<number | null>;
}

export function createBudgetFormStore(initial: {
  id: number | null;
  name: string;
  description: string;
  budget: BudgetInput;
}) {
  return createStore<BudgetFormState>()((set, get) => ({
    id: initial.id,
    name: initial.name,
    description: initial.description,
    draft: draftFromBudget(initial.budget),
    errors: {},
    saving: false,
    saved: null,
    setName: (name) => set((s) => ({ name, saved: null, errors: { ...s.errors, name: "" } })),
    setDescription: (description) => set({ description, saved: null }),
    setField: (path, text) =>
      set((s) => ({ draft: { ...s.draft, [path]: text }, saved: null, errors: { ...s.errors, [path]: "" } })),
    applyPreset: (preset) =>
      set((s) => ({
        draft: draftFromBudget(preset.budget),
        name: s.name.trim() ? s.name : preset.name,
        description: s.description.trim() ? s.description : preset.description,
        errors: {},
        saved: null,
      })),
    validate() {
      const { name, description, draft } = get();
      const body = { name, description: description.trim() || undefined, ...budgetFromDraft(draft) };
      const parsed = budgetRequest.safeParse(body);
      if (parsed.success) {
        set({ errors: {} });
        return body;
      }
      const errors: Record<string, string> = {};
      for (const issue of parsed.error.issues) {
        const path = issue.path.join(".");
        const field = path === "name" || path === "description" ? path : (fieldForPath(path) ?? "");
        errors[field] ??= issue.message;
      }
      set({ errors });
      return null;
    },
    async save() {
      const body = get().validate();
      if (!body) return null;
      const { id } = get();
      set({ saving: true, saved: null });
      try {
        const r = await api<{ id: number; name: string }>(id ? `/api/v1/budgets/${id}` : "/api/v1/budgets", {
          method: id ? "PUT" : "POST",
          json: body,
        });
        set({ saving: false, id: r.id, saved: `Saved “${r.name}”.` });
        return r.id;
      } catch (e) {
        const err = e as ApiCallError;
        const field = err.path ? (err.path === "name" ? "name" : (fieldForPath(err.path) ?? "")) : "";
        set((s) => ({ saving: false, errors: { ...s.errors, [field]: err.message } }));
        return null;
      }
    },
  }));
}
