// The commands of the engine's command line. To add one: write its file beside this one, import it
// and list it below — nothing else dispatches.
import type { Command } from "../defineCommand.ts";
import { berCommand } from "./ber.ts";
import { ctleResponseCommand } from "./ctleResponse.ts";
import { eyeCommand } from "./eye.ts";
import { firResponseCommand } from "./firResponse.ts";
import { lmsCommand } from "./lms.ts";
import { mmseCommand } from "./mmse.ts";
import { optimizeCommand } from "./optimize.ts";
import { populationCommand } from "./population.ts";
import { prbsCommand } from "./prbs.ts";
import { pulseCommand } from "./pulse.ts";
import { zfCommand } from "./zf.ts";

export const commands: readonly Command[] = [
  pulseCommand,
  firResponseCommand,
  ctleResponseCommand,
  zfCommand,
  mmseCommand,
  lmsCommand,
  prbsCommand,
  berCommand,
  eyeCommand,
  optimizeCommand,
  populationCommand,
];
