// Work that runs beside the requests in the web server process, started on the first request.
import { deliverQueuedMail, startMailRetries } from "./mail/mail.server";

let started = false;

export function startBackgroundWork(): void {
  if (started) return;
  started = true;
  startMailRetries();
  void deliverQueuedMail().catch((e) => console.error("[tapwright] mail delivery:", e));
}
