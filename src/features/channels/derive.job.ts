// A channel's derivation as the engine worker runs it: the request's options in, the derived
// channel or the ChannelInputError's parts out (an Error loses its reason and path crossing threads).
import { ChannelInputError, deriveFromFile, deriveSynthetic, type FileOptions } from "./derive";
import type { AggressorSpec } from "./aggressors";
import type { DerivedChannel, LossModel } from "./channels";
import type { Modulation } from "@lib/types";

/** What to derive: an uploaded file (its bytes shared with the web process, not copied) or a loss model. */
export type DeriveInput =
  | { source: "file"; file: FileOptions }
  | {
      source: "synthetic";
      bitRate_bps: number;
      modulation: Modulation;
      lossModel: LossModel;
      aggressors?: AggressorSpec[];
    };

export interface DeriveTask {
  derive: DeriveInput;
}

export type DeriveOutcome =
  | { ok: true; derived: DerivedChannel }
  | { ok: false; reason: ChannelInputError["reason"]; message: string; path: string };

/** Derives in the worker thread; input errors come back as values. */
export function deriveInWorker(input: DeriveInput): DeriveOutcome {
  try {
    const derived =
      input.source === "file"
        ? deriveFromFile(input.file)
        : deriveSynthetic(input.bitRate_bps, input.modulation, input.lossModel, input.aggressors);
    return { ok: true, derived };
  } catch (e) {
    if (e instanceof ChannelInputError) return { ok: false, reason: e.reason, message: e.message, path: e.path };
    throw e;
  }
}
