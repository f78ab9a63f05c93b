// State of the upload form: the chosen file, its fields, its aggressors (pairs of a multi-port file,
// files of their own, coupling models), the SDD21/pulse preview, progress and the reader's error.
// One store per form instance.
import { createStore } from "zustand/vanilla";
import { sendForm } from "./sendForm";
import { MAX_UPLOAD_BYTES, commonPairings, formatBytes, type DerivedChannel, type PortPairs } from "./channels";
import { MAX_CHANNEL_AGGRESSORS, type AggressorSpec } from "./aggressors";
import type { Modulation } from "@lib/types";

export type CsvKind = "pulse-csv" | "step-csv" | "impulse-csv";
/** The victim file's format; "multiport" is an .s8p, .s12p or .s16p file (a lane with its neighbours). */
export type FileFormat = "csv" | "s2p" | "s4p" | "multiport" | "other";

/** One aggressor row of the form (numbers as typed, in the form's units). */
export interface AggressorRow {
  id: number;
  source: AggressorSpec["source"];
  kind: "next" | "fext";
  name: string;
  /** Ports of the pair in the victim's multi-port file. */
  p: string;
  n: string;
  /** The aggressor's own file. */
  file: File | null;
  csvKind: CsvKind;
  /** Coupling model: K_b (NEXT) or K_f·T_D in ps (FEXT), the line's loss (dB) and delay (ns). */
  coefficient: string;
  lineLoss_dB: string;
  lineDelay_ns: string;
}

export interface UploadFields {
  name: string;
  bitRate_Gbps: string;
  modulation: Modulation;
  csvKind: CsvKind;
  pairs: PortPairs;
  riseTime_ps: string;
  aggressors: AggressorRow[];
}

export interface UploadState {
  file: File | null;
  format: FileFormat;
  /** Port count of a Touchstone file (from its extension). */
  ports: number;
  fields: UploadFields;
  /** "preview": deriving without saving; "upload": sending the file; "derive": the server is working. */
  phase: "idle" | "preview" | "upload" | "derive";
  progress: number;
  error: { message: string; path?: string } | null;
  preview: DerivedChannel | null;
  pickFile(file: File | null): void;
  setFields(patch: Partial<UploadFields>): void;
  addAggressor(source: AggressorRow["source"]): void;
  updateAggressor(id: number, patch: Partial<AggressorRow>): void;
  removeAggressor(id: number): void;
  runPreview(): Promise<void>;
  /** Uploads; resolves to the new channel's id, or null when the server refused the file. */
  upload(): Promise<number | null>;
}

export function formatOf(filename: string): FileFormat {
  const ext = filename.toLowerCase().split(".").pop() ?? "";
  if (ext === "csv" || ext === "txt") return "csv";
  if (ext === "s2p" || ext === "s4p") return ext;
  if (ext === "s8p" || ext === "s12p" || ext === "s16p") return "multiport";
  return "other";
}

/** Port count of a Touchstone file name (0 for other files). */
export function portsOf(filename: string): number {
  const m = /\.s(\d+)p$/i.exec(filename);
  return m ? Number(m[1]) : 0;
}

/** The API's aggressor specs for the form's rows (files travel as aggressor0, aggressor1, …). */
export function aggressorSpecsOf(rows: readonly AggressorRow[]): unknown[] {
  return rows.map((r, i) => {
    const common = { kind: r.kind, ...(r.name.trim() ? { name: r.name.trim() } : {}) };
    if (r.source === "ports") return { source: "ports", ...common, p: Number(r.p), n: Number(r.n) };
    if (r.source === "file")
      return {
        source: "file",
        ...common,
        field: `aggressor${i}`,
        ...(r.file && formatOf(r.file.name) === "csv" ? { csvKind: r.csvKind } : {}),
      };
    const c = Number(r.coefficient);
    return {
      source: "coupling",
      ...common,
      coupling: {
        ...(r.kind === "next" ? { backwardCoefficient: c } : { forwardCoupling_s: c * 1e-12 }),
        lossAtNyquist_dB: Number(r.lineLoss_dB),
        delay_s: Number(r.lineDelay_ns) * 1e-9,
      },
    };
  });
}

export function createUploadStore() {
  return createStore<UploadState>()((set, get) => {
    function form(): FormData {
      const { file, fields, format } = get();
      const f = new FormData();
      f.set("file", file!);
      f.set("name", fields.name.trim() || file!.name);
      f.set("bitRate_bps", String(Number(fields.bitRate_Gbps) * 1e9));
      f.set("modulation", fields.modulation);
      if (format === "csv") f.set("kind", fields.csvKind);
      if (format === "s4p" || format === "multiport") f.set("pairs", JSON.stringify(fields.pairs));
      if (fields.riseTime_ps.trim()) f.set("riseTime_s", String(Number(fields.riseTime_ps) * 1e-12));
      if (fields.aggressors.length > 0) {
        f.set("aggressors", JSON.stringify(aggressorSpecsOf(fields.aggressors)));
        fields.aggressors.forEach((r, i) => {
          if (r.source === "file" && r.file) f.set(`aggressor${i}`, r.file);
        });
      }
      return f;
    }
    function checkBeforeSend(): boolean {
      const { file, fields } = get();
      if (!file) {
        set({ error: { message: "Choose a file first (drop it here or use the picker).", path: "file" } });
        return false;
      }
      if (file.size > MAX_UPLOAD_BYTES) {
        set({
          error: {
            message: `${file.name} is ${formatBytes(file.size)}; the limit is ${formatBytes(MAX_UPLOAD_BYTES)}.`,
            path: "file",
          },
        });
        return false;
      }
      const rate = Number(fields.bitRate_Gbps);
      if (!(rate >= 0.1 && rate <= 400)) {
        set({ error: { message: "Give the bit rate in Gb/s, between 0.1 and 400.", path: "bitRate_bps" } });
        return false;
      }
      const missing = fields.aggressors.findIndex((r) => r.source === "file" && !r.file);
      if (missing >= 0) {
        set({ error: { message: `Choose the file of aggressor ${missing + 1}, or remove it.`, path: "aggressors" } });
        return false;
      }
      return true;
    }
    let previewSeq = 0;
    let rowSeq = 0;
    return {
      file: null,
      format: "other",
      ports: 0,
      fields: {
        name: "",
        bitRate_Gbps: "28",
        modulation: "nrz",
        csvKind: "pulse-csv",
        pairs: commonPairings[0].pairs,
        riseTime_ps: "",
        aggressors: [],
      },
      phase: "idle",
      progress: 0,
      error: null,
      preview: null,
      pickFile(file) {
        const format = file ? formatOf(file.name) : "other";
        const ports = file ? portsOf(file.name) : 0;
        set((s) => ({
          file,
          format,
          ports,
          preview: null,
          error:
            file && format === "other"
              ? {
                  message: `${file.name}: Tapwright reads .csv / .txt responses and .s2p / .s4p Touchstone files (.s8p / .s12p / .s16p with neighbours).`,
                  path: "file",
                }
              : null,
          fields: {
            ...s.fields,
            name: s.fields.name || (file ? file.name.replace(/\.[^.]+$/, "") : ""),
            // A multi-port file's victim defaults to the first pair on each side; pairs of another file do not apply.
            pairs:
              format === "multiport"
                ? { inP: 1, inN: 2, outP: ports / 2 + 1, outN: ports / 2 + 2 }
                : format === "s4p"
                  ? s.fields.pairs
                  : commonPairings[0].pairs,
            aggressors:
              format === "multiport" ? s.fields.aggressors : s.fields.aggressors.filter((r) => r.source !== "ports"),
          },
        }));
        if (file && (format === "s2p" || format === "s4p" || format === "multiport")) void get().runPreview();
      },
      addAggressor(source) {
        if (get().fields.aggressors.length >= MAX_CHANNEL_AGGRESSORS) return;
        const row: AggressorRow = {
          id: ++rowSeq,
          source,
          kind: source === "coupling" ? "fext" : "next",
          name: "",
          p: "",
          n: "",
          file: null,
          csvKind: "pulse-csv",
          coefficient: source === "coupling" ? "2" : "",
          lineLoss_dB: "20",
          lineDelay_ns: "2",
        };
        set((s) => ({ fields: { ...s.fields, aggressors: [...s.fields.aggressors, row] }, preview: null }));
      },
      updateAggressor(id, patch) {
        set((s) => ({
          fields: { ...s.fields, aggressors: s.fields.aggressors.map((r) => (r.id === id ? { ...r, ...patch } : r)) },
          preview: null,
        }));
      },
      removeAggressor(id) {
        set((s) => ({
          fields: { ...s.fields, aggressors: s.fields.aggressors.filter((r) => r.id !== id) },
          preview: null,
        }));
      },
      setFields(patch) {
        set((s) => ({ fields: { ...s.fields, ...patch } }));
        const s = get();
        if ((patch.pairs || patch.bitRate_Gbps || patch.modulation) && s.preview && s.file) void s.runPreview();
      },
      async runPreview() {
        if (!checkBeforeSend()) return;
        const mine = ++previewSeq;
        set({ phase: "preview", progress: 0, error: null });
        try {
          const preview = await sendForm<DerivedChannel>("/api/v1/channels/preview", form(), (p) =>
            set({ progress: p.total ? p.sent / p.total : 0 }),
          );
          if (mine === previewSeq) set({ preview, phase: "idle" });
        } catch (e) {
          const err = e as Error & { path?: string };
          if (mine === previewSeq)
            set({ error: { message: err.message, path: err.path }, phase: "idle", preview: null });
        }
      },
      async upload() {
        if (!checkBeforeSend()) return null;
        set({ phase: "upload", progress: 0, error: null });
        try {
          const r = await sendForm<{ id: number }>("/api/v1/channels", form(), (p) =>
            set(p.uploaded ? { phase: "derive", progress: 1 } : { progress: p.total ? p.sent / p.total : 0 }),
          );
          set({ phase: "idle" });
          return r.id;
        } catch (e) {
          const err = e as Error & { path?: string };
          set({ error: { message: err.message, path: err.path }, phase: "idle" });
          return null;
        }
      },
    };
  });
}
