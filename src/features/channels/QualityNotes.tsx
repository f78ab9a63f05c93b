// What the engine found when it judged an uploaded Touchstone file: the checks in one line, and each
// warning in words a designer can act on. Shown on the upload preview and the channel page.
import type { InputQuality } from "@lib/channel";

const ghz = (f_Hz: number) => `${Number((f_Hz / 1e9).toPrecision(3))} GHz`;
const mhz = (f_Hz: number) => `${Number((f_Hz / 1e6).toPrecision(3))} MHz`;

/** The checks as short phrases, in a fixed order. */
export function qualitySummary(q: InputQuality): string[] {
  return [
    `${q.passive ? "passive" : "not passive"} (largest singular value ${q.maxSingularValue.toFixed(4)})`,
    `${q.reciprocal ? "reciprocal" : "not reciprocal"} (|S − Sᵀ| ≤ ${q.maxReciprocityError === 0 ? "0" : q.maxReciprocityError.toPrecision(2)})`,
    `${q.causal ? "causal" : "not causal"} (${(100 * q.preOnsetEnergy).toPrecision(2)} % of the energy before the onset)`,
    `data to ${ghz(q.bandCoverage.fmax_Hz)} (${q.bandCoverage.baudRatio.toFixed(2)}× the baud rate)`,
    `step ${mhz(q.frequencyStep.df_Hz)} (holds ${Number((q.frequencyStep.maxDelay_s * 1e9).toPrecision(3))} ns)`,
    `DC point ${q.dcPoint}`,
    ...(q.modeConversion_dB === null ? [] : [`|SCD21| ≤ ${Math.max(q.modeConversion_dB, -99).toFixed(1)} dB`]),
  ];
}

export default function QualityNotes({ quality }: { quality: InputQuality | null }) {
  if (!quality) return null;
  return (
    <div className="text-sm" data-testid="input-quality">
      <p className="text-ink-soft">
        <span className="text-muted">Input checks: </span>
        {qualitySummary(quality).join(" · ")}.
      </p>
      {quality.warnings.length > 0 && (
        <ul
          className="notice notice-warn mt-2 list-disc space-y-1 pl-6"
          aria-label="Input warnings"
          data-testid="input-warnings"
        >
          {quality.warnings.map((w) => (
            <li key={w.code} data-code={w.code}>
              {w.message.charAt(0).toUpperCase() + w.message.slice(1)}.
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
