// Upload a channel file: drag-and-drop or the picker; CSV response kind or, for a 4-port Touchstone
// file, the port pairing with a preview of SDD21 and the pulse before saving; a progress bar; the
// reader's error inline (it names the line).
import { useRef, useState } from "react";
import { useStore } from "zustand";
import { createUploadStore, type CsvKind } from "./uploadStore";
import { formatMillivolts } from "@/components/format";
import { commonPairings, formatBytes, formatDb, type PortPairs } from "./channels";
import ChannelCharts from "./ChannelCharts";
import AggressorCharts from "./AggressorCharts";
import AggressorRows from "./AggressorRows";
import QualityNotes from "./QualityNotes";
import type { Modulation } from "@lib/types";

const csvKinds: { value: CsvKind; label: string }[] = [
  { value: "pulse-csv", label: "Pulse response" },
  { value: "step-csv", label: "Step response" },
  { value: "impulse-csv", label: "Impulse response" },
];

const samePairs = (a: PortPairs, b: PortPairs) =>
  a.inP === b.inP && a.inN === b.inN && a.outP === b.outP && a.outN === b.outN;

export default function UploadForm() {
  const [store] = useState(createUploadStore);
  const s = useStore(store);
  const [dragging, setDragging] = useState(false);
  const input = useRef<HTMLInputElement>(null);
  const busy = s.phase !== "idle";
  const pairingIndex = commonPairings.findIndex((p) => samePairs(p.pairs, s.fields.pairs));
  const [custom, setCustom] = useState(false);

  async function submit(e: React.FormEvent) {
    e.preventDefault();
    const id = await s.upload();
    if (id !== null) location.href = `/channels/${id}`;
  }

  const setPort = (k: keyof PortPairs) => (e: React.ChangeEvent<HTMLInputElement>) =>
    s.setFields({ pairs: { ...s.fields.pairs, [k]: Number(e.target.value) } });

  return (
    <form className="flex flex-col gap-4" onSubmit={submit} aria-label="Upload a channel file">
      <div
        className={`flex flex-col items-center justify-center gap-2 rounded-lg border-2 border-dashed px-6 py-8 text-center text-sm ${
          dragging ? "border-accent bg-accent-soft" : "border-line-strong bg-paper"
        }`}
        data-testid="drop-zone"
        onDragOver={(e) => {
          e.preventDefault();
          setDragging(true);
        }}
        onDragLeave={() => setDragging(false)}
        onDrop={(e) => {
          e.preventDefault();
          setDragging(false);
          const file = e.dataTransfer.files[0];
          if (file) s.pickFile(file);
        }}
      >
        <p className="text-ink-soft">
          Drop a <strong>.csv</strong> pulse, step or impulse response, a Touchstone <strong>.s2p</strong> /{" "}
          <strong>.s4p</strong> file, or a lane with its neighbours in one <strong>.s8p</strong> /{" "}
          <strong>.s12p</strong> / <strong>.s16p</strong> file here
        </p>
        <label className="btn cursor-pointer">
          Choose a file…
          <input
            ref={input}
            type="file"
            className="sr-only"
            aria-label="Channel file"
            accept=".csv,.txt,.s2p,.s4p,.s8p,.s12p,.s16p"
            onChange={(e) => s.pickFile(e.target.files?.[0] ?? null)}
          />
        </label>
        {s.file && (
          <p className="num text-xs text-ink" data-testid="chosen-file">
            {s.file.name} · {formatBytes(s.file.size)}
          </p>
        )}
        <p className="help">
          Up to 50 MiB. CSV: time in s and voltage in V, one sample per line; a header line is allowed.
        </p>
      </div>

      <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
        <div className="field">
          <label htmlFor="up-name" className="font-medium text-ink-soft">
            Name
          </label>
          <input
            id="up-name"
            aria-describedby="up-name-help"
            className="input"
            name="name"
            value={s.fields.name}
            onChange={(e) => s.setFields({ name: e.target.value })}
            required
            maxLength={200}
          />
          <span id="up-name-help" className="help">
            How the channel appears in lists, e.g. "Slot 3 lane 2, 18 in".
          </span>
        </div>
        <div className="field">
          <label htmlFor="up-bit-rate-gb-s" className="font-medium text-ink-soft">
            Bit rate (Gb/s)
          </label>
          <input
            id="up-bit-rate-gb-s"
            aria-describedby="up-bit-rate-gb-s-help"
            className="input num"
            name="bitRate"
            inputMode="decimal"
            value={s.fields.bitRate_Gbps}
            onChange={(e) => s.setFields({ bitRate_Gbps: e.target.value })}
            required
          />
          <span id="up-bit-rate-gb-s-help" className="help">
            The line rate; with PAM4 the symbol rate is half of it.
          </span>
        </div>
        <div className="field">
          <label htmlFor="up-modulation" className="font-medium text-ink-soft">
            Modulation
          </label>
          <select
            id="up-modulation"
            aria-describedby="up-modulation-help"
            className="input"
            value={s.fields.modulation}
            onChange={(e) => s.setFields({ modulation: e.target.value as Modulation })}
          >
            <option value="nrz">NRZ</option>
            <option value="pam4">PAM4</option>
          </select>
          <span id="up-modulation-help" className="help">
            Sets the unit interval the pulse is built for.
          </span>
        </div>
        <div className="field">
          <label htmlFor="up-transmitter-rise-time-ps-optional" className="font-medium text-ink-soft">
            Transmitter rise time (ps, optional)
          </label>
          <input
            id="up-transmitter-rise-time-ps-optional"
            aria-describedby="up-transmitter-rise-time-ps-optional-help"
            className="input num"
            inputMode="decimal"
            value={s.fields.riseTime_ps}
            onChange={(e) => s.setFields({ riseTime_ps: e.target.value })}
            placeholder="none"
          />
          <span id="up-transmitter-rise-time-ps-optional-help" className="help">
            10–90 % edge of the transmitted symbol; leave empty for an ideal edge.
          </span>
        </div>
      </div>

      {s.format === "csv" && (
        <fieldset className="field">
          <legend className="mb-1 text-sm font-medium text-ink-soft">The CSV holds a…</legend>
          <div className="flex gap-4 text-sm">
            {csvKinds.map((k) => (
              <label key={k.value} className="flex items-center gap-1.5">
                <input
                  type="radio"
                  name="csvKind"
                  value={k.value}
                  checked={s.fields.csvKind === k.value}
                  onChange={() => s.setFields({ csvKind: k.value })}
                />
                {k.label}
              </label>
            ))}
          </div>
          <span className="help">
            A step response is differenced over one UI; an impulse response (in 1/s) is integrated first.
          </span>
        </fieldset>
      )}

      {s.format === "s4p" && (
        <fieldset className="flex flex-col gap-2">
          <legend className="mb-1 text-sm font-medium text-ink-soft">
            Port pairing (SDD21 = ½(S[oP][iP] − S[oP][iN] − S[oN][iP] + S[oN][iN]))
          </legend>
          <div className="flex flex-wrap items-end gap-3">
            <label className="field">
              <span>Pairing</span>
              <select
                className="input"
                aria-label="Port pairing"
                value={custom || pairingIndex < 0 ? "custom" : String(pairingIndex)}
                onChange={(e) => {
                  if (e.target.value === "custom") setCustom(true);
                  else {
                    setCustom(false);
                    s.setFields({ pairs: commonPairings[Number(e.target.value)].pairs });
                  }
                }}
              >
                {commonPairings.map((p, i) => (
                  <option key={p.label} value={i}>
                    {p.label}
                  </option>
                ))}
                <option value="custom">Other ports…</option>
              </select>
            </label>
            {(custom || pairingIndex < 0) &&
              (["inP", "inN", "outP", "outN"] as const).map((k) => (
                <label key={k} className="field w-20">
                  <span>{{ inP: "In +", inN: "In −", outP: "Out +", outN: "Out −" }[k]}</span>
                  <input
                    className="input num"
                    type="number"
                    min={1}
                    max={4}
                    value={s.fields.pairs[k]}
                    onChange={setPort(k)}
                  />
                </label>
              ))}
            <button type="button" className="btn" disabled={busy || !s.file} onClick={() => void s.runPreview()}>
              Preview SDD21
            </button>
          </div>
          <span className="help">
            The preview derives SDD21 and the pulse without saving; change the pairing until the loss looks like a
            through channel.
          </span>
        </fieldset>
      )}

      {s.format === "multiport" && (
        <fieldset className="flex flex-col gap-2">
          <legend className="mb-1 text-sm font-medium text-ink-soft">
            This lane's ports in the {s.ports}-port file (its SDD21 is the victim's channel)
          </legend>
          <div className="flex flex-wrap items-end gap-3">
            {(["inP", "inN", "outP", "outN"] as const).map((k) => (
              <label key={k} className="field w-20">
                <span>{{ inP: "In +", inN: "In −", outP: "Out +", outN: "Out −" }[k]}</span>
                <input
                  className="input num"
                  type="number"
                  min={1}
                  max={s.ports}
                  aria-label={`Victim ${k}`}
                  value={s.fields.pairs[k]}
                  onChange={setPort(k)}
                />
              </label>
            ))}
            <button type="button" className="btn" disabled={busy || !s.file} onClick={() => void s.runPreview()}>
              Preview
            </button>
          </div>
          <span className="help">
            By default the first pair on each side (ports 1,2 → {s.ports / 2 + 1},{s.ports / 2 + 2}). Name the
            neighbours' pairs as aggressors below.
          </span>
        </fieldset>
      )}

      {s.file && s.format !== "other" && (
        <AggressorRows
          rows={s.fields.aggressors}
          multiPorts={s.format === "multiport" ? s.ports : 0}
          disabled={busy}
          onAdd={s.addAggressor}
          onChange={s.updateAggressor}
          onRemove={s.removeAggressor}
        />
      )}

      {s.error && (
        <p className="notice notice-bad" role="alert" data-testid="upload-error">
          {s.error.message}
        </p>
      )}

      {busy && (
        <div className="flex flex-col gap-1" role="status" aria-live="polite">
          <div
            className="h-2 overflow-hidden rounded bg-line"
            role="progressbar"
            aria-label="Upload progress"
            aria-valuemin={0}
            aria-valuemax={100}
            aria-valuenow={Math.round(s.progress * 100)}
          >
            <div
              className="h-full bg-accent transition-[width]"
              style={{ width: `${Math.round(s.progress * 100)}%` }}
            />
          </div>
          <span className="text-xs text-muted">
            {s.phase === "derive"
              ? "Uploaded; deriving the pulse response…"
              : s.phase === "preview"
                ? `Previewing… ${Math.round(s.progress * 100)} %`
                : `Uploading… ${Math.round(s.progress * 100)} %`}
          </span>
        </div>
      )}

      {s.preview && (
        <section className="rounded-lg border border-line p-4" aria-label="Preview" data-testid="upload-preview">
          <p className="mb-3 text-sm text-ink-soft">
            Preview (not saved): loss at Nyquist <span className="num">{formatDb(s.preview.lossAtNyquist_dB)}</span>,
            main cursor <span className="num">{formatMillivolts(s.preview.mainCursor_V)}</span>.
          </p>
          <ChannelCharts
            pulse={s.preview.pulse}
            insertionLoss={s.preview.insertionLoss}
            lossAtNyquist_dB={s.preview.lossAtNyquist_dB}
            transfer={String(s.preview.derivation.transfer ?? "S21")}
            height={240}
          />
          <div className="mt-3">
            <QualityNotes quality={s.preview.quality} />
          </div>
          {s.preview.aggressors.length > 0 && (
            <div className="mt-4" data-testid="preview-aggressors">
              <p className="mb-2 text-sm text-ink-soft">
                {s.preview.aggressors.length} aggressor{s.preview.aggressors.length === 1 ? "" : "s"}; ICN for 1 Vppd:{" "}
                {s.preview.aggressors.map((a) => `${a.name} ${formatMillivolts(a.icnRms_V)}`).join(", ")}.
              </p>
              <AggressorCharts
                aggressors={s.preview.aggressors}
                insertionLoss={s.preview.insertionLoss}
                transfer={String(s.preview.derivation.transfer ?? "S21")}
                height={220}
              />
            </div>
          )}
        </section>
      )}

      <div className="flex gap-3">
        <button className="btn btn-primary" type="submit" disabled={busy || !s.file || s.format === "other"}>
          Upload and derive the pulse
        </button>
        {s.file && s.format !== "s4p" && s.format !== "multiport" && s.format !== "other" && !s.preview && (
          <button type="button" className="btn" disabled={busy} onClick={() => void s.runPreview()}>
            Preview first
          </button>
        )}
      </div>
    </form>
  );
}
