import { randomUUID } from "node:crypto";
import { mkdir, readdir, readFile, writeFile } from "node:fs/promises";
import path from "node:path";
import { simpleParser } from "mailparser";
import { SMTPServer } from "smtp-server";

/**
 * A local stand-in for the company's mail provider: accepts every message on
 * 127.0.0.1 and keeps it as <id>.eml (the raw message) and <id>.json (envelope,
 * subject and the decoded text and HTML parts), for developers and tests.
 */

export type StoredMail = {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  messageId: string | null;
  text: string;
  html: string;
};

export type MailSink = {
  port: number;
  storeDir: string;
  /** Every message stored so far, oldest first. */
  messages(): Promise<StoredMail[]>;
  stop(): Promise<void>;
};

export async function startMailSink(options: { port: number; storeDir: string; host?: string }): Promise<MailSink> {
  const { port, storeDir } = options;
  await mkdir(storeDir, { recursive: true });
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    banner: "Patina local mail sink",
    logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (chunk: Buffer) => chunks.push(chunk));
      stream.on("error", callback);
      stream.on("end", () => {
        const raw = Buffer.concat(chunks);
        const envelopeTo = session.envelope.rcptTo.map((r) => r.address);
        const from = session.envelope.mailFrom ? session.envelope.mailFrom.address : "";
        parseMessage(raw)
          .then((parsed) => {
            const stored = { ...parsed, id: mailId(), receivedAt: new Date().toISOString(), from, to: envelopeTo };
            return Promise.all([
              writeFile(path.join(storeDir, `${stored.id}.eml`), raw),
              writeFile(path.join(storeDir, `${stored.id}.json`), `${JSON.stringify(stored, null, 2)}\n`),
            ]);
          })
          .then(() => callback(), callback);
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, options.host ?? "127.0.0.1", () => {
      server.off("error", reject);
      resolve();
    });
  });
  server.on("error", (error) => console.error("[mail sink]", error));
  return {
    port,
    storeDir,
    messages: () => readStoredMail(storeDir),
    stop: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

/** Sortable by arrival: time first, then a random tail. */
function mailId(): string {
  return `${new Date().toISOString().replace(/[-:.]/g, "")}-${randomUUID().slice(0, 8)}`;
}

export async function readStoredMail(storeDir: string): Promise<StoredMail[]> {
  let names: string[];
  try {
    names = await readdir(storeDir);
  } catch {
    return [];
  }
  const files = names.filter((n) => n.endsWith(".json")).sort();
  return Promise.all(files.map(async (n) => JSON.parse(await readFile(path.join(storeDir, n), "utf8")) as StoredMail));
}

/** Subject, message id and the text and HTML parts, decoded by mailparser. */
export async function parseMessage(raw: string | Buffer): Promise<Pick<StoredMail, "subject" | "messageId" | "text" | "html">> {
  const mail = await simpleParser(raw, { skipHtmlToText: true, skipTextToHtml: true, skipTextLinks: true, skipImageLinks: true });
  return {
    subject: mail.subject ?? "",
    messageId: mail.messageId ?? null,
    text: (mail.text ?? "").replace(/\r?\n$/, ""),
    html: typeof mail.html === "string" ? mail.html : "",
  };
}
