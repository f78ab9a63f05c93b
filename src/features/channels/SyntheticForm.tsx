// A synthetic channel from the loss model: loss at Nyquist (skin √f and dielectric f terms with
// causal phase) and an optional delay.
import { useState } from "react";
import { api } from "@/components/api";
import { useSubmit } from "@/components/useSubmit";

export default function SyntheticForm() {
  const [f, setF] = useState({
    name: "",
    bitRate_Gbps: "28",
    modulation: "nrz",
    loss_dB: "20",
    delay_ns: "",
    skin: "",
  });
  const { busy, error, submit } = useSubmit();
  const set = (k: keyof typeof f) => (e: React.ChangeEvent<HTMLInputElement | HTMLSelectElement>) =>
    setF({ ...f, [k]: e.target.value });

  function create(e: React.FormEvent) {
    e.preventDefault();
    void submit(async () => {
      const r = await api<{ id: number }>("/api/v1/channels", {
        method: "POST",
        json: {
          name: f.name.trim() || `Synthetic ${f.loss_dB} dB at Nyquist`,
          bitRate_bps: Number(f.bitRate_Gbps) * 1e9,
          modulation: f.modulation,
          lossModel: {
            lossAtNyquist_dB: Number(f.loss_dB),
            ...(f.delay_ns.trim() ? { delay_s: Number(f.delay_ns) * 1e-9 } : {}),
            ...(f.skin.trim() ? { skinFraction: Number(f.skin) } : {}),
          },
        },
      });
      location.href = `/channels/${r.id}`;
    });
  }

  return (
    <form className="flex flex-col gap-4" onSubmit={create} aria-label="Synthetic channel">
      <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
        <div className="field">
          <label htmlFor="syn-name" className="font-medium text-ink-soft">
            Name
          </label>
          <input
            id="syn-name"
            aria-describedby="syn-name-help"
            className="input"
            value={f.name}
            onChange={set("name")}
            placeholder="Synthetic 20 dB at Nyquist"
            maxLength={200}
          />
          <span id="syn-name-help" className="help">
            Leave empty to name it after its loss.
          </span>
        </div>
        <div className="field">
          <label htmlFor="syn-bit-rate-gb-s" className="font-medium text-ink-soft">
            Bit rate (Gb/s)
          </label>
          <input
            id="syn-bit-rate-gb-s"
            aria-describedby="syn-bit-rate-gb-s-help"
            className="input num"
            inputMode="decimal"
            value={f.bitRate_Gbps}
            onChange={set("bitRate_Gbps")}
            required
          />
          <span id="syn-bit-rate-gb-s-help" className="help">
            Nyquist is half the symbol rate.
          </span>
        </div>
        <div className="field">
          <label htmlFor="syn-modulation" className="font-medium text-ink-soft">
            Modulation
          </label>
          <select
            id="syn-modulation"
            aria-describedby="syn-modulation-help"
            className="input"
            value={f.modulation}
            onChange={set("modulation")}
          >
            <option value="nrz">NRZ</option>
            <option value="pam4">PAM4</option>
          </select>
          <span id="syn-modulation-help" className="help">
            PAM4 halves the symbol rate for the same bit rate.
          </span>
        </div>
        <div className="field">
          <label htmlFor="syn-loss-at-nyquist-db" className="font-medium text-ink-soft">
            Loss at Nyquist (dB)
          </label>
          <input
            id="syn-loss-at-nyquist-db"
            aria-describedby="syn-loss-at-nyquist-db-help"
            className="input num"
            inputMode="decimal"
            value={f.loss_dB}
            onChange={set("loss_dB")}
            required
          />
          <span id="syn-loss-at-nyquist-db-help" className="help">
            0.5 … 60 dB. Roughly: under 10 dB short reach, 20–30 dB backplane, above 30 dB very long.
          </span>
        </div>
        <div className="field">
          <label htmlFor="syn-delay-ns-optional" className="font-medium text-ink-soft">
            Delay (ns, optional)
          </label>
          <input
            id="syn-delay-ns-optional"
            aria-describedby="syn-delay-ns-optional-help"
            className="input num"
            inputMode="decimal"
            value={f.delay_ns}
            onChange={set("delay_ns")}
            placeholder="0"
          />
          <span id="syn-delay-ns-optional-help" className="help">
            Flight time; it shifts the pulse but changes no eye.
          </span>
        </div>
        <div className="field">
          <label htmlFor="syn-skin-loss-share-0-1-optional" className="font-medium text-ink-soft">
            Skin-loss share (0–1, optional)
          </label>
          <input
            id="syn-skin-loss-share-0-1-optional"
            aria-describedby="syn-skin-loss-share-0-1-optional-help"
            className="input num"
            inputMode="decimal"
            value={f.skin}
            onChange={set("skin")}
            placeholder="0.35"
          />
          <span id="syn-skin-loss-share-0-1-optional-help" className="help">
            Share of the Nyquist loss from the √f conductor term; the rest is dielectric.
          </span>
        </div>
      </div>
      {error && (
        <p className="notice notice-bad" role="alert">
          {error}
        </p>
      )}
      <div>
        <button className="btn btn-primary" type="submit" disabled={busy}>
          {busy ? "Deriving…" : "Create the synthetic channel"}
        </button>
      </div>
    </form>
  );
}
