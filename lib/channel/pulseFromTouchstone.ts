// Touchstone text → channel transfer (S21 or SDD21) → pulse response, in one call.
import { parseTouchstone } from "./parseTouchstone.ts";
import { renormalizeNetwork } from "./renormalizeNetwork.ts";
import { pulseFromS21, type S21Pulse, type S21PulseOptions } from "./pulseFromS21.ts";
import { channelTransfer, type PortPairs } from "./sdd21.ts";

/**
 * Reads a Touchstone file and returns its channel's pulse response: S21 for a 2-port, SDD21 with
 * `pairs` for 4 or more ports (see {@link channelTransfer}, {@link pulseFromS21}), after re-referencing
 * every port to 50 Ω ({@link renormalizeNetwork}).
 *
 * @param text - the Touchstone file's text.
 * @param options - grid and shaping; `ports` from the file name when known, `pairs` for ≥ 4 ports.
 * @throws InputFileError for a malformed file, RangeError for unusable options.
 */
export function pulseFromTouchstone(
  text: string,
  options: S21PulseOptions & { readonly ports?: number; readonly pairs?: PortPairs },
): S21Pulse {
  const net = renormalizeNetwork(parseTouchstone(text, { ports: options.ports }));
  return pulseFromS21(net.freqs_Hz, channelTransfer(net, options.pairs), options);
}
