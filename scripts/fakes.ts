// Local stand-ins for the side services, on loopback only: an S3-compatible object store (s3rver)
// and an SMTP catcher (smtp-server) that stores each message it receives as JSON.
//   S3_PORT (4569), S3_DIR, S3_BUCKET (cluepath), SMTP_PORT (2525), MAIL_CAPTURE_DIR
import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { simpleParser, type AddressObject } from "mailparser";
import S3rver from "s3rver";
import { SMTPServer } from "smtp-server";

const s3Port = Number(process.env.S3_PORT ?? 4569);
const smtpPort = Number(process.env.SMTP_PORT ?? 2525);
const s3Dir = process.env.S3_DIR ?? ".data/s3";
const bucket = process.env.S3_BUCKET ?? "cluepath";
const captureDir = process.env.MAIL_CAPTURE_DIR ?? ".data/mail";
mkdirSync(s3Dir, { recursive: true });
mkdirSync(captureDir, { recursive: true });

const s3 = new S3rver({
  port: s3Port,
  address: "127.0.0.1",
  silent: true,
  directory: s3Dir,
  configureBuckets: [{ name: bucket, configs: [] }],
});
await s3.run();

const addresses = (a: AddressObject | AddressObject[] | undefined) =>
  (Array.isArray(a) ? a : a ? [a] : []).flatMap((x) => x.value.map((v) => v.address ?? "")).filter(Boolean);

const smtp = new SMTPServer({
  authOptional: true,
  disabledCommands: ["STARTTLS"],
  size: 30 * 1024 * 1024,
  onData(stream, _session, callback) {
    simpleParser(stream)
      .then((mail) => {
        const id = `${Date.now()}-${crypto.randomUUID().slice(0, 8)}`;
        const record = {
          id,
          receivedAt: new Date().toISOString(),
          shopId: (mail.headers.get("x-cluepath-shop") as string | undefined) ?? null,
          reportId: (mail.headers.get("x-cluepath-report") as string | undefined) ?? null,
          from: mail.from?.text ?? "",
          to: addresses(mail.to),
          subject: mail.subject ?? "",
          text: mail.text ?? "",
          html: typeof mail.html === "string" ? mail.html : null,
          attachments: mail.attachments.map((a) => ({ filename: a.filename ?? "attachment", contentType: a.contentType, size: a.size })),
        };
        writeFileSync(join(captureDir, `${id}.json`), JSON.stringify(record, null, 2));
        callback();
      })
      .catch((e: Error) => callback(e));
  },
});
await new Promise<void>((resolve) => smtp.listen(smtpPort, "127.0.0.1", resolve));
console.log(`› fakes up: S3 on http://127.0.0.1:${s3Port} (bucket ${bucket}), SMTP on 127.0.0.1:${smtpPort} → ${captureDir}`);

const stop = async () => {
  smtp.close();
  await s3.close();
  process.exit(0);
};
process.on("SIGTERM", stop);
process.on("SIGINT", stop);
