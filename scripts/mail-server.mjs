// The local stand-in for an SMTP relay: accepts every message on loopback and keeps it as JSON
// in EMBERLINE_MAIL_DIR, where the app's mailbox page and the tests read it.
import crypto from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { simpleParser } from "mailparser";
import { SMTPServer } from "smtp-server";

const dir = process.env.EMBERLINE_MAIL_DIR;
const port = Number(process.env.EMBERLINE_SMTP_PORT ?? 2525);
if (!dir) throw new Error("EMBERLINE_MAIL_DIR is required");
fs.mkdirSync(dir, { recursive: true });

const server = new SMTPServer({
  authOptional: true,
  disabledCommands: ["STARTTLS"],
  size: 10 * 1024 * 1024,
  onData(stream, session, callback) {
    simpleParser(stream)
      .then((mail) => {
        const id = `${Date.now().toString().padStart(15, "0")}-${crypto.randomBytes(4).toString("hex")}`;
        const record = {
          id,
          receivedAt: new Date().toISOString(),
          from: mail.from?.text ?? "",
          to: session.envelope.rcptTo.map((r) => r.address),
          subject: mail.subject ?? "",
          text: mail.text ?? "",
          html: typeof mail.html === "string" ? mail.html : "",
        };
        const tmp = path.join(dir, `.${id}.tmp`);
        fs.writeFileSync(tmp, JSON.stringify(record, null, 2));
        fs.renameSync(tmp, path.join(dir, `${id}.json`));
        callback();
      })
      .catch((error) => callback(error));
  },
});

server.listen(port, "127.0.0.1", () => {
  process.stdout.write(
    `[emberline] Fake SMTP server on 127.0.0.1:${port}, keeping mail in ${dir}\n`,
  );
});
const stop = () => server.close(() => process.exit(0));
process.on("SIGTERM", stop);
process.on("SIGINT", stop);
