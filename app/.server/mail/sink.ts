import { randomUUID } from "node:crypto";
import { mkdir, readdir, readFile, writeFile } from "node:fs/promises";
import path from "node:path";
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
        const raw = Buffer.concat(chunks).toString("utf8");
        const envelopeTo = session.envelope.rcptTo.map((r) => r.address);
        const from = session.envelope.mailFrom ? session.envelope.mailFrom.address : "";
        const stored = { ...parseMessage(raw), id: mailId(), receivedAt: new Date().toISOString(), from, to: envelopeTo };
        Promise.all([
          writeFile(path.join(storeDir, `${stored.id}.eml`), raw),
          writeFile(path.join(storeDir, `${stored.id}.json`), `${JSON.stringify(stored, null, 2)}\n`),
        ]).then(() => callback(), callback);
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

type Part = { headers: Map<string, string>; body: string };

function splitHeaders(raw: string): Part {
  const normalised = raw.replace(/\r\n/g, "\n");
  const end = normalised.indexOf("\n\n");
  const head = end === -1 ? normalised : normalised.slice(0, end);
  const body = end === -1 ? "" : normalised.slice(end + 2);
  const headers = new Map<string, string>();
  for (const line of head.replace(/\n[ \t]+/g, " ").split("\n")) {
    const colon = line.indexOf(":");
    if (colon > 0) headers.set(line.slice(0, colon).trim().toLowerCase(), line.slice(colon + 1).trim());
  }
  return { headers, body };
}

function decodeBody(body: string, encoding: string | undefined): string {
  switch ((encoding ?? "7bit").toLowerCase()) {
    case "base64":
      return Buffer.from(body.replace(/\s+/g, ""), "base64").toString("utf8");
    case "quoted-printable":
      return Buffer.from(
        body.replace(/=\n/g, "").replace(/=([0-9A-Fa-f]{2})/g, (_, hex: string) => String.fromCharCode(parseInt(hex, 16))),
        "latin1",
      ).toString("utf8");
    default:
      return body;
  }
}

/** RFC 2047 encoded words, as nodemailer writes non-ASCII subjects. */
function decodeWords(value: string): string {
  return value
    .replace(/\?=\s+=\?/g, "?==?")
    .replace(/=\?([^?]+)\?([BbQq])\?([^?]*)\?=/g, (_, _charset: string, kind: string, text: string) =>
      kind.toUpperCase() === "B"
        ? Buffer.from(text, "base64").toString("utf8")
        : Buffer.from(
            text.replace(/_/g, " ").replace(/=([0-9A-Fa-f]{2})/g, (__, hex: string) => String.fromCharCode(parseInt(hex, 16))),
            "latin1",
          ).toString("utf8"),
    );
}

function collectParts(part: Part, into: { text: string; html: string }) {
  const type = part.headers.get("content-type") ?? "text/plain";
  const boundary = /boundary="?([^";]+)"?/i.exec(type)?.[1];
  if (type.toLowerCase().startsWith("multipart/") && boundary) {
    const sections = part.body.split(`--${boundary}`).slice(1);
    for (const section of sections) {
      if (section.startsWith("--")) break;
      collectParts(splitHeaders(section.replace(/^\n/, "")), into);
    }
    return;
  }
  const decoded = decodeBody(part.body, part.headers.get("content-transfer-encoding"));
  if (type.toLowerCase().startsWith("text/html")) into.html ||= decoded;
  else if (type.toLowerCase().startsWith("text/plain")) into.text ||= decoded;
}

export function parseMessage(raw: string): Pick<StoredMail, "subject" | "messageId" | "text" | "html"> {
  const top = splitHeaders(raw);
  const parts = { text: "", html: "" };
  collectParts(top, parts);
  return {
    subject: decodeWords(top.headers.get("subject") ?? ""),
    messageId: top.headers.get("message-id") ?? null,
    text: parts.text.replace(/\n$/, ""),
    html: parts.html,
  };
}
