// A finding about a channel's input data, in words a designer can act on.

/** A warning about a channel's input: a stable code for programs and a message for people. */
export interface ChannelWarning {
  /** Stable identifier, e.g. `"band-below-baud"`, `"not-passive"`. */
  readonly code: string;
  /** What was found, with the figure, and what to do about it. */
  readonly message: string;
}
