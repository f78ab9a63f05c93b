// `population`: one default setting for a class of channels (minimax), optionally in register codes.
import { populationRequestSchema } from "../../contract/population.ts";
import { populationDefault } from "../../tapTables/populationDefault.ts";
import { defineCommand } from "../defineCommand.ts";

/**
 * `population`: → `{ setting: { tx: { taps }, ctle: { gDc_dB, gDc2_dB }, dfe: { taps } }, codes, values,
 * worstHeadroom_V, worstChannel, channels: [{ defaultHeadroom_V, defaultEyeHeight_V, samplingPhase_UI,
 * dfeTaps, ffeTaps, crosstalk, ownHeadroom_V, own: { tx, ctle } }] }` (`setting.ffe` and each channel's
 * `ffeTaps` with a receive FFE; `crosstalk` per channel with aggressors, given per pulse in `aggressors`).
 */
export const populationCommand = defineCommand({
  name: "population",
  schema: populationRequestSchema,
  errorPaths: { aliases: { field: "registerMap" }, fallback: "pulses" },
  run: (r) => populationDefault(r.pulses, r.budget, { registerMap: r.registerMap, aggressors: r.aggressors }),
});
