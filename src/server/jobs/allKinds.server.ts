// Every kind of job, registered by importing the feature modules that define them: the web server's
// background work and the standalone worker process both import this one list.
import "@/features/runs/runs.server";
import "@/features/studies/studies.server";
import "@/features/tapTables/tapTableVersions.server";
import "@/features/sweeps/sweeps.server";
