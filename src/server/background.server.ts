// Work that runs beside the requests in the web server process, started on the first request.
import { deliverQueuedMail, startMailRetries } from "./mail/mail.server";
import { startJobBackend } from "./jobs/queue.server";
import "./jobs/allKinds.server";

let started = false;

export function startBackgroundWork(): void {
  if (started) return;
  started = true;
  startMailRetries();
  startJobBackend();
  void deliverQueuedMail().catch((e) => console.error("[tapwright] mail delivery:", e));
}
