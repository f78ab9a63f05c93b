// The local fake SMTP server for development and tests (smtp-server): it accepts every message
// and keeps it in the dev_mailbox table, where admins read it at /api/v1/dev/mail.
import { log } from "./log.mjs";

export async function startFakeSmtp({ port, databaseUrl }) {
  const { SMTPServer } = await import("smtp-server");
  const { simpleParser } = await import("mailparser");
  const mysql = await import("mysql2/promise");
  const pool = mysql.createPool({ uri: databaseUrl, connectionLimit: 2 });
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    banner: "Tapwright fake SMTP (messages are kept, never delivered)",
    size: 10 * 1024 * 1024,
    onData(stream, session, callback) {
      const chunks = [];
      stream.on("data", (c) => chunks.push(c));
      stream.on("end", async () => {
        try {
          const raw = Buffer.concat(chunks).toString("utf8");
          const parsed = await simpleParser(raw);
          await pool.execute(
            "INSERT INTO dev_mailbox (envelope_from, envelope_to, subject, body_text, raw) VALUES (?, ?, ?, ?, ?)",
            [
              session.envelope.mailFrom ? session.envelope.mailFrom.address : null,
              session.envelope.rcptTo.map((r) => r.address).join(", "),
              (parsed.subject ?? "").slice(0, 300),
              parsed.text ?? "",
              raw,
            ],
          );
          callback();
        } catch (e) {
          callback(e);
        }
      });
    },
  });
  server.on("error", (e) => log(`fake SMTP: ${e.message}`));
  await new Promise((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, "127.0.0.1", resolve);
  });
  log(`Fake SMTP server on 127.0.0.1:${port} (messages kept in dev_mailbox).`);
  return {
    async close() {
      await new Promise((resolve) => server.close(resolve));
      await pool.end();
    },
  };
}
