// Touchstone text → channel transfer (S21 or SDD21) → pulse response and the file's judgement, in one call.
import { inputQuality, type InputQuality } from "./inputQuality.ts";
import { parseTouchstone } from "./parseTouchstone.ts";
import { pulseFromS21, type S21Pulse, type S21PulseOptions } from "./pulseFromS21.ts";
import { renormalizeNetwork } from "./renormalizeNetwork.ts";
import { channelTransfer, type PortPairs } from "./sdd21.ts";

/** A Touchstone channel's pulse with the judgement of its file. */
export interface TouchstonePulse extends S21Pulse {
  readonly quality: InputQuality;
}

/**
 * Reads a Touchstone file and returns its channel's pulse response: S21 for a 2-port, SDD21 with
 * `pairs` for 4 or more ports (see {@link channelTransfer}, {@link pulseFromS21}), after re-referencing
 * every port to 50 Ω ({@link renormalizeNetwork}); `quality` judges the file ({@link inputQuality}).
 *
 * @param text - the Touchstone file's text.
 * @param options - grid and shaping; `ports` from the file name when known, `pairs` for ≥ 4 ports.
 * @throws InputFileError for a malformed file, RangeError for unusable options.
 */
export function pulseFromTouchstone(
  text: string,
  options: S21PulseOptions & { readonly ports?: number; readonly pairs?: PortPairs },
): TouchstonePulse {
  const net = renormalizeNetwork(parseTouchstone(text, { ports: options.ports }));
  const transfer = channelTransfer(net, options.pairs);
  const built = pulseFromS21(net.freqs_Hz, transfer, options);
  return {
    ...built,
    quality: inputQuality(net, transfer, built, {
      ui_s: options.ui_s,
      samplesPerUi: options.samplesPerUi,
      pairs: options.pairs,
    }),
  };
}
