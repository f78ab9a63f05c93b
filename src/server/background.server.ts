// Work that runs beside the requests in the web server process, started on the first request.
import { deliverQueuedMail, startMailRetries } from "./mail/mail.server";
import { startJobDispatcher } from "./jobs/queue.server";
import "@/features/studies/studies.server";
import "@/features/tapTables/tapTables.server";
import "@/features/runs/runs.server";

let started = false;

export function startBackgroundWork(): void {
  if (started) return;
  started = true;
  startMailRetries();
  startJobDispatcher();
  void deliverQueuedMail().catch((e) => console.error("[tapwright] mail delivery:", e));
}
