// `pulse`: a channel given as samples, CSV, Touchstone or a loss model, turned into a pulse response.
import { InputFileError } from "../../channel/InputFileError.ts";
import { pulseFromLossModel } from "../../channel/lossModel.ts";
import type { FrequencyPulse } from "../../channel/pulseFromS21.ts";
import { pulseFromSamples, type PulseWithTime } from "../../channel/pulseFromSamples.ts";
import { pulseFromTouchstone } from "../../channel/pulseFromTouchstone.ts";
import { readCsvResponse } from "../../channel/readCsvResponse.ts";
import { pulseRequestSchema } from "../../contract/pulse.ts";
import { CliInputError } from "../CliInputError.ts";
import { defineCommand } from "../defineCommand.ts";

/**
 * `pulse`: → `{ ui_s, samplesPerUi, values_V, mainIndex, start_s }` plus `insertionLoss` for
 * Touchstone and loss-model sources, and `quality` (the file's judgement, see `inputQuality`) for
 * Touchstone sources; `start_s` is the time of the first sample.
 */
export const pulseCommand = defineCommand({
  name: "pulse",
  schema: pulseRequestSchema,
  errorPaths: { aliases: { pairs: "source.pairs", values: "source.values", dt_s: "source.dt_s" }, fallback: "source" },
  run: (r) => {
    const grid = { ui_s: r.ui_s, samplesPerUi: r.samplesPerUi, riseTime_s: r.riseTime_s };
    const src = r.source;
    let built: PulseWithTime | FrequencyPulse;
    try {
      if (src.kind === "samples") {
        built = pulseFromSamples(
          { response: src.response, values: Float64Array.from(src.values), dt_s: src.dt_s },
          grid,
        );
      } else if (src.kind === "csv") {
        const rec = readCsvResponse(src.text);
        built = pulseFromSamples({ response: src.response, values: rec.values, time_s: rec.time_s }, grid);
      } else if (src.kind === "touchstone") {
        const ports = src.format === undefined ? undefined : Number(src.format.slice(1, -1));
        built = pulseFromTouchstone(src.text, { ...grid, ports, pairs: src.pairs });
      } else {
        built = pulseFromLossModel(src, grid);
      }
    } catch (e) {
      if (e instanceof InputFileError) throw new CliInputError(e.message, "source.text");
      throw e;
    }
    const { pulse, start_s } = built;
    return {
      ui_s: pulse.ui_s,
      samplesPerUi: pulse.samplesPerUi,
      values_V: pulse.values_V,
      mainIndex: pulse.mainIndex,
      start_s,
      ...("insertionLoss" in built ? { insertionLoss: built.insertionLoss } : {}),
      ...("quality" in built ? { quality: built.quality } : {}),
    };
  },
});
