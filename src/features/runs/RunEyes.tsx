// The eyes of a tuning run at the limiter, before (channel alone) and after equalization — and, when
// the channel has aggressors, after equalization without them: density images with the statistical
// eye's BER contours, optionally on one voltage scale.
import { useMemo, useState } from "react";
import DensityEye, { type EyeOpening } from "@/components/charts/DensityEye";
import { unpackEye, type PackedEye } from "./runs";
import type { Modulation } from "@lib/types";

interface Props {
  before: PackedEye;
  after: PackedEye;
  /** The after-eye's contours without the aggressors (omitted: the channel has none). */
  withoutCrosstalk?: PackedEye;
  modulation: Modulation;
}

const mV = (v: number) => v * 1e3;

/** The noise and jitter an image carries, in words ("1.50 mV rms noise, RJ 0.010 UI rms, DJ 0.050 UI"). */
function spreadText(s: PackedEye["spread"]): string {
  if (!s) return "noise and jitter not recorded by this engine version";
  const parts = [`${mV(s.noiseRms_V).toFixed(2)} mV rms noise`];
  if (s.rjRms_UI > 0 || s.djPp_UI > 0) parts.push(`RJ ${s.rjRms_UI.toFixed(3)} UI rms, DJ ${s.djPp_UI.toFixed(3)} UI`);
  else parts.push("no jitter");
  return parts.join(", ");
}

function span(a: readonly number[], b: readonly number[]): [number, number] {
  const step = Math.abs(a[1] - a[0]);
  const all = [...a, ...b];
  return [Math.min(...all) - step / 2, Math.max(...all) + step / 2];
}

export default function RunEyes(props: Props) {
  const before = useMemo(() => unpackEye(props.before), [props.before]);
  const after = useMemo(() => unpackEye(props.after), [props.after]);
  const without = useMemo(
    () => (props.withoutCrosstalk === undefined ? null : unpackEye(props.withoutCrosstalk)),
    [props.withoutCrosstalk],
  );
  const [sameScale, setSameScale] = useState(false);
  const shared = useMemo(() => span(before.image.voltage_V, after.image.voltage_V), [before, after]);
  const opening = (h: number): EyeOpening[] =>
    props.modulation === "nrz" && h > 0
      ? [{ time_UI: 0, low_V: -h / 2, high_V: h / 2, label: `${mV(h).toFixed(1)} mV` }]
      : [];

  return (
    <section className="card" aria-label="Eyes">
      <h2>Eyes at the limiter</h2>
      <p className="help mt-1">
        Density of a {after.symbols.source} stream ({after.symbols.count} symbols) folded over two UI, with the
        statistical eye's noise and jitter folded in ({spreadText(after.spread)}); the lines are the statistical eye's
        BER contours from the same noise and jitter.
      </p>
      <label className="mt-2 flex items-center gap-2 text-sm text-ink-soft">
        <input type="checkbox" checked={sameScale} onChange={(e) => setSameScale(e.target.checked)} />
        Same voltage scale for both eyes
      </label>
      <div className="mt-4 grid gap-6 xl:grid-cols-2">
        <div>
          <h3>Before: the channel alone</h3>
          <p className="help">
            Transmit swing only — no FIR, CTLE or DFE.{" "}
            {before.eyeHeight_V > 0
              ? `Eye height ${mV(before.eyeHeight_V).toFixed(1)} mV.`
              : "The eye is closed at the target BER."}
          </p>
          <DensityEye
            image={before.image}
            contours={before.contours}
            openings={opening(before.eyeHeight_V)}
            voltageDomain_V={sameScale ? shared : undefined}
            ariaLabel="Eye before equalization"
            testId="eye-before"
          />
        </div>
        <div>
          <h3>After: transmit FIR, CTLE and DFE{without !== null ? ", with crosstalk" : ""}</h3>
          <p className="help">
            The chosen setting, DFE feedback included
            {without !== null ? "; the contours count every aggressor at its worst phase" : ""}.{" "}
            {after.eyeHeight_V > 0
              ? `Eye height ${mV(after.eyeHeight_V).toFixed(1)} mV.`
              : "The eye is still closed at the target BER."}
          </p>
          <DensityEye
            image={after.image}
            contours={after.contours}
            openings={opening(after.eyeHeight_V)}
            voltageDomain_V={sameScale ? shared : undefined}
            ariaLabel="Eye after equalization"
            testId="eye-after"
          />
        </div>
        {without !== null && (
          <div>
            <h3>After, without crosstalk</h3>
            <p className="help">
              The same setting and sampling phase with the aggressors left out (both images fold the victim's own
              symbols; the crosstalk shows in the contours).{" "}
              {without.eyeHeight_V > 0
                ? `Eye height ${mV(without.eyeHeight_V).toFixed(1)} mV.`
                : "The eye is closed at the target BER."}
            </p>
            <DensityEye
              image={without.image}
              contours={without.contours}
              openings={opening(without.eyeHeight_V)}
              voltageDomain_V={sameScale ? shared : undefined}
              ariaLabel="Eye after equalization without crosstalk"
              testId="eye-without-crosstalk"
            />
          </div>
        )}
      </div>
    </section>
  );
}
