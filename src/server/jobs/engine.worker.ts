// The engine worker (bundled to dist/engine-worker.mjs, run by piscina off the event loop): one
// function per kind of job, each taking the job's input and posting progress 0…1 on `port`.
import type { MessagePort } from "node:worker_threads";
import type { JobKind } from "@/features/jobs/jobs";
import { computeStudy } from "@/features/studies/studies.job";
import type { StudyInputs } from "@/features/studies/studies";
import {
  computeTableClass,
  computeTableMember,
  computeTableVersionJob,
  type TableClassInput,
  type TableMemberInput,
  type TableVersionJob,
} from "@/features/tapTables/tapTables.job";
import { computeRun, type RunJobInput } from "@/features/runs/runs.job";
import { computeSweepBatch, summarizeSweep, type SweepBatchInput } from "@/features/sweeps/sweeps.job";
import { deriveInWorker, type DeriveTask } from "@/features/channels/derive.job";

interface Task {
  kind: JobKind;
  input: unknown;
  port: MessagePort;
}

export default async function engineTask(task: Task | DeriveTask): Promise<unknown> {
  if ("derive" in task) return deriveInWorker(task.derive);
  const { kind, input, port } = task;
  const progress = (fraction: number) => port.postMessage(fraction);
  if (kind === "run") return computeRun(input as RunJobInput, progress);
  if (kind === "study") return computeStudy(input as StudyInputs, progress);
  if (kind === "table-member") return computeTableMember(input as TableMemberInput, progress);
  if (kind === "table-class") return computeTableClass(input as TableClassInput, progress);
  if (kind === "table-version") return computeTableVersionJob(input as TableVersionJob, progress);
  if (kind === "sweep-batch") return computeSweepBatch(input as SweepBatchInput, progress);
  if (kind === "sweep") return summarizeSweep(input as Parameters<typeof summarizeSweep>[0]);
  throw new Error(`The engine worker cannot run jobs of kind ${kind}.`);
}
