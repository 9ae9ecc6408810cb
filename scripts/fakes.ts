/**
 * Local stand-ins for the hosted services, for development and tests only:
 *  - SMTP on 127.0.0.1:SMTP_PORT (default 2525) that keeps every message it receives, with a small
 *    inbox at http://127.0.0.1:MAIL_UI_PORT (default 2580): `/` lists messages, `/messages.json` returns
 *    them as JSON, `DELETE /messages` empties the inbox.
 *  - S3 on 127.0.0.1:S3_PORT (default 4569) with the `coldtrail-files` bucket (s3rver).
 * Files live under FAKES_DIR (default .coldtrail/fakes).
 */
import { createServer } from "node:http";
import { mkdirSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { SMTPServer } from "smtp-server";
import { simpleParser } from "mailparser";
import S3rver from "s3rver";

const root = resolve(process.env.FAKES_DIR ?? join(import.meta.dirname, "..", ".coldtrail", "fakes"));
const mailDir = join(root, "mail");
const s3Dir = join(root, "s3");
mkdirSync(mailDir, { recursive: true });
mkdirSync(s3Dir, { recursive: true });

const smtpPort = Number(process.env.SMTP_PORT ?? 2525);
const mailUiPort = Number(process.env.MAIL_UI_PORT ?? 2580);
const s3Port = Number(process.env.S3_PORT ?? 4569);
const bucket = process.env.S3_BUCKET ?? "coldtrail-files";

interface StoredMail {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string;
}

let counter = 0;
const smtp = new SMTPServer({
  authOptional: true,
  disabledCommands: ["STARTTLS"],
  logger: false,
  onData(stream, session, callback) {
    const chunks: Buffer[] = [];
    stream.on("data", (c: Buffer) => chunks.push(c));
    stream.on("end", () => void storeMail());
    async function storeMail() {
      try {
        const raw = Buffer.concat(chunks);
        const parsed = await simpleParser(raw);
        const id = `${Date.now()}-${String(++counter).padStart(4, "0")}`;
        const to = session.envelope.rcptTo.map((r) => r.address.toLowerCase());
        const mail: StoredMail = {
          id,
          receivedAt: new Date().toISOString(),
          from: session.envelope.mailFrom ? session.envelope.mailFrom.address : "",
          to,
          subject: parsed.subject ?? "",
          text: parsed.text ?? "",
          html: typeof parsed.html === "string" ? parsed.html : "",
        };
        writeFileSync(join(mailDir, `${id}.eml`), raw);
        writeFileSync(join(mailDir, `${id}.json`), JSON.stringify(mail, null, 2));
        callback();
      } catch (err) {
        callback(err as Error);
      }
    }
  },
});

function readMail(): StoredMail[] {
  return readdirSync(mailDir)
    .filter((f) => f.endsWith(".json"))
    .sort()
    .map((f) => JSON.parse(readFileSync(join(mailDir, f), "utf8")) as StoredMail);
}

const escapeHtml = (s: string) => s.replace(/[&<>"]/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;" })[c]!);

const mailUi = createServer((req, res) => {
  const url = new URL(req.url ?? "/", `http://127.0.0.1:${mailUiPort}`);
  if (req.method === "DELETE" && url.pathname === "/messages") {
    for (const f of readdirSync(mailDir)) rmSync(join(mailDir, f));
    res.writeHead(204).end();
    return;
  }
  if (url.pathname === "/messages.json") {
    const to = url.searchParams.get("to")?.toLowerCase();
    const list = readMail().filter((m) => !to || m.to.includes(to));
    res.writeHead(200, { "content-type": "application/json" }).end(JSON.stringify(list));
    return;
  }
  const rows = readMail()
    .reverse()
    .map(
      (m) =>
        `<article><h2>${escapeHtml(m.subject)}</h2><p><b>To:</b> ${escapeHtml(m.to.join(", "))} · ${escapeHtml(m.receivedAt)}</p><pre>${escapeHtml(m.text)}</pre></article>`,
    )
    .join("<hr>");
  res
    .writeHead(200, { "content-type": "text/html; charset=utf-8" })
    .end(
      `<!doctype html><html lang="en"><title>Coldtrail local inbox</title><body style="font-family:sans-serif;max-width:60rem;margin:2rem auto"><h1>Local inbox (development only)</h1>${rows || "<p>No mail yet.</p>"}</body></html>`,
    );
});

const s3 = new S3rver({
  port: s3Port,
  address: "127.0.0.1",
  directory: s3Dir,
  silent: true,
  configureBuckets: [{ name: bucket, configs: [] }],
});

async function main() {
  await new Promise<void>((ok, fail) => smtp.listen(smtpPort, "127.0.0.1", () => ok()).once("error", fail));
  await new Promise<void>((ok, fail) => mailUi.listen(mailUiPort, "127.0.0.1", () => ok()).once("error", fail));
  await s3.run();
  console.log(`[fakes] SMTP 127.0.0.1:${smtpPort} · inbox http://127.0.0.1:${mailUiPort} · S3 http://127.0.0.1:${s3Port}/${bucket}`);
}

function stop() {
  smtp.close(() => undefined);
  mailUi.close();
  void s3.close().finally(() => process.exit(0));
  setTimeout(() => process.exit(0), 1000).unref();
}
process.on("SIGTERM", stop);
process.on("SIGINT", stop);

main().catch((err) => {
  console.error("[fakes] could not start:", err);
  process.exit(1);
});
