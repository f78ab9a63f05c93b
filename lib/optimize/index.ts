// The optimizer's public API: budgets resolved against pulses, the optimizer and the joint search,
// and the per-setting evaluation that tuning runs, tap tables and the app use. The search's and the
// bounds' internals (./search/, ./bound/) are imported by path inside lib/optimize only.
export { channelFor, type CtleChannel, equalizedCursors } from "./ctleChannel.ts";
export {
  evaluateSetting,
  finishEye,
  KERNEL_FLOOR_FACTOR,
  kernelFloorOf,
  type PhaseEye,
  phaseEye,
  type PreparedEye,
  prepareEye,
} from "./evaluateSetting.ts";
export {
  type Candidate,
  type CtleOutcome,
  jointSearch,
  type JointSearchOptions,
  type JointSearchResult,
} from "./jointSearch.ts";
export {
  optimize,
  type OptimizeDetail,
  optimizeDetailed,
  type OptimizeOptions,
  type OptimizeResult,
  type SettingResult,
  tidyTap,
  type TopSetting,
} from "./optimize.ts";
export { type PreparedChannels, prepareChannels } from "./prepareChannels.ts";
export { MAX_SEARCH_SIZE, type SearchSize, searchSize, searchSizeProblem } from "./searchSize.ts";
export {
  bitsPerSymbol,
  CONTINUOUS_SCAFFOLD_STEP,
  type CtleSetting,
  resolveBudget,
  type SearchSpace,
  searchSpace,
} from "./searchSpace.ts";
export type { Verdict } from "./verdict.ts";
