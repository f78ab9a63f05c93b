// State of the upload form: the chosen file, its fields, the SDD21/pulse preview, progress and the
// reader's error. One store per form instance.
import { createStore } from "zustand/vanilla";
import { sendForm } from "./sendForm";
import { MAX_UPLOAD_BYTES, commonPairings, formatBytes, type DerivedChannel, type PortPairs } from "./channels";

export type CsvKind = "pulse-csv" | "step-csv" | "impulse-csv";
export type FileFormat = "csv" | "s2p" | "s4p" | "other";

export interface UploadFields {
  name: string;
  bitRate_Gbps: string;
  modulation: "nrz" | "pam4";
  csvKind: CsvKind;
  pairs: PortPairs;
  riseTime_ps: string;
}

export interface UploadState {
  file: File | null;
  format: FileFormat;
  fields: UploadFields;
  /** "preview": deriving without saving; "upload": sending the file; "derive": the server is working. */
  phase: "idle" | "preview" | "upload" | "derive";
  progress: number;
  error: { message: string; path?: string } | null;
  preview: DerivedChannel | null;
  pickFile(file: File | null): void;
  setFields(patch: Partial<UploadFields>): void;
  runPreview(): Promise<void>;
  /** Uploads; resolves to the new channel's id, or null when the server refused the file. */
  upload(): Promise<number | null>;
}

export function formatOf(filename: string): FileFormat {
  const ext = filename.toLowerCase().split(".").pop() ?? "";
  if (ext === "csv" || ext === "txt") return "csv";
  if (ext === "s2p" || ext === "s4p") return ext;
  return "other";
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
      if (format === "s4p") f.set("pairs", JSON.stringify(fields.pairs));
      if (fields.riseTime_ps.trim()) f.set("riseTime_s", String(Number(fields.riseTime_ps) * 1e-12));
      return f;
    }
    function checkBeforeSend(): boolean {
      const { file, fields } = get();
      if (!file) {
        set({ error: { message: "Choose a file first (drop it here or use the picker).", path: "file" } });
        return false;
      }
      if (file.size > MAX_UPLOAD_BYTES) {
        set({ error: { message: `${file.name} is ${formatBytes(file.size)}; the limit is ${formatBytes(MAX_UPLOAD_BYTES)}.`, path: "file" } });
        return false;
      }
      const rate = Number(fields.bitRate_Gbps);
      if (!(rate >= 0.1 && rate <= 400)) {
        set({ error: { message: "Give the bit rate in Gb/s, between 0.1 and 400.", path: "bitRate_bps" } });
        return false;
      }
      return true;
    }
    let previewSeq = 0;
    return {
      file: null,
      format: "other",
      fields: { name: "", bitRate_Gbps: "28", modulation: "nrz", csvKind: "pulse-csv", pairs: commonPairings[0].pairs, riseTime_ps: "" },
      phase: "idle",
      progress: 0,
      error: null,
      preview: null,
      pickFile(file) {
        const format = file ? formatOf(file.name) : "other";
        set((s) => ({
          file,
          format,
          preview: null,
          error:
            file && format === "other"
              ? { message: `${file.name}: Tapwright reads .csv / .txt responses and .s2p / .s4p Touchstone files.`, path: "file" }
              : null,
          fields: { ...s.fields, name: s.fields.name || (file ? file.name.replace(/\.[^.]+$/, "") : "") },
        }));
        if (file && (format === "s2p" || format === "s4p")) void get().runPreview();
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
          if (mine === previewSeq) set({ error: { message: err.message, path: err.path }, phase: "idle", preview: null });
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
