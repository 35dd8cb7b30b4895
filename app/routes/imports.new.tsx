import { useRef, useState } from "react";
import { Link, useNavigate } from "react-router";
import { requireArea } from "~/.server/guard";
import { importConfig } from "~/.server/imports/config";
import { ProgressBar } from "~/components/imports/progress-bar";
import type { Route } from "./+types/imports.new";

export const meta: Route.MetaFunction = () => [{ title: "Upload a log · Patina" }];

export async function loader({ context }: Route.LoaderArgs) {
  requireArea(context, "imports");
  return { maxMegabytes: Math.round(importConfig().maxBytes / 1024 / 1024) };
}

type Sending = { state: "idle" } | { state: "sending"; sent: number; total: number } | { state: "failed"; message: string };

/** Posts the file with XMLHttpRequest, whose upload events give the transfer progress. */
function sendFile(file: File, onProgress: (sent: number, total: number) => void): Promise<{ uploadId: string; next: string }> {
  return new Promise((resolve, reject) => {
    const request = new XMLHttpRequest();
    request.open("POST", "/api/imports/uploads");
    request.setRequestHeader("Accept", "application/json");
    request.upload.onprogress = (event) => onProgress(event.loaded, event.lengthComputable ? event.total : file.size);
    request.onload = () => {
      let body: { uploadId?: string; next?: string; error?: { message?: string } } = {};
      try {
        body = JSON.parse(request.responseText);
      } catch {
        // not JSON: fall through to the status message
      }
      if (request.status === 201 && body.uploadId && body.next) resolve({ uploadId: body.uploadId, next: body.next });
      else reject(new Error(body.error?.message ?? `The upload was refused (status ${request.status}).`));
    };
    request.onerror = () => reject(new Error("The connection dropped during the upload. Try again."));
    const form = new FormData();
    form.append("file", file);
    request.send(form);
  });
}

export default function NewImport({ loaderData }: Route.ComponentProps) {
  const navigate = useNavigate();
  const input = useRef<HTMLInputElement>(null);
  const [sending, setSending] = useState<Sending>({ state: "idle" });

  async function onSubmit(event: React.FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const file = input.current?.files?.[0];
    if (!file) {
      setSending({ state: "failed", message: "Choose a CSV file first." });
      return;
    }
    if (file.size > loaderData.maxMegabytes * 1024 * 1024) {
      setSending({ state: "failed", message: `The file is larger than ${loaderData.maxMegabytes} MB. Split it into smaller files.` });
      return;
    }
    setSending({ state: "sending", sent: 0, total: file.size });
    try {
      const { next } = await sendFile(file, (sent, total) => setSending({ state: "sending", sent, total }));
      navigate(next);
    } catch (error) {
      setSending({ state: "failed", message: error instanceof Error ? error.message : String(error) });
    }
  }

  return (
    <div className="max-w-2xl space-y-6">
      <div>
        <p className="text-sm text-muted">
          <Link to="/imports" className="underline">Imports</Link>
        </p>
        <h1 className="text-2xl font-semibold tracking-tight">Upload a log</h1>
        <p className="mt-1 text-muted">
          A CSV file of past water tests and treatments, as saved by a spreadsheet: commas, semicolons or tabs, UTF-8 or
          Windows-1252. Nothing is stored until you have checked the columns and pressed Import.
        </p>
      </div>
      <form
        method="post"
        action="/api/imports/uploads"
        encType="multipart/form-data"
        onSubmit={onSubmit}
        className="space-y-4 rounded-xl border border-line bg-white p-4"
      >
        <div>
          <label htmlFor="file" className="block font-medium">CSV file</label>
          <input
            ref={input}
            id="file"
            name="file"
            type="file"
            accept=".csv,.tsv,.txt,text/csv,text/plain"
            required
            className="mt-1 block w-full text-sm file:mr-3 file:rounded-lg file:border file:border-line file:bg-paper file:px-3 file:py-2"
          />
          <p className="mt-1 text-xs text-muted">Up to {loaderData.maxMegabytes} MB per file.</p>
        </div>
        {sending.state === "sending" ? (
          <ProgressBar label="Sending the file" done={sending.sent} total={sending.total} />
        ) : null}
        {sending.state === "failed" ? (
          <p role="alert" className="rounded-lg border border-alert bg-white p-3 text-sm text-alert">{sending.message}</p>
        ) : null}
        <button
          type="submit"
          disabled={sending.state === "sending"}
          className="rounded-lg bg-verdigris-700 px-4 py-2 font-medium text-white hover:bg-verdigris-900 disabled:opacity-60"
        >
          {sending.state === "sending" ? "Sending…" : "Upload and check"}
        </button>
      </form>
    </div>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
