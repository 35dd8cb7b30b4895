import { z } from "zod";
import { plainId } from "~/lib/strict-params";
import { data, Form, Link, useNavigation } from "react-router";
import { requireArea } from "~/.server/guard";
import { importHistory } from "~/.server/imports/check";
import { undoBatch } from "~/.server/imports/commit";
import { uploadsInProgress } from "~/.server/imports/uploads";
import { TextLink } from "~/components/text-link";
import { formatCount, formatDateTime } from "~/lib/format";
import type { Route } from "./+types/imports";

export const meta: Route.MetaFunction = () => [{ title: "Imports · Patina" }];

export async function loader({ context }: Route.LoaderArgs) {
  const scope = requireArea(context, "imports");
  const [batches, uploads] = await Promise.all([importHistory(scope), uploadsInProgress(scope)]);
  return { batches, uploads, timeZone: scope.timeZone };
}

const undoForm = z.object({
  intent: z.literal("undo", { error: "intent must be undo" }),
  batchId: plainId("batchId"),
});

export async function action({ request, context }: Route.ActionArgs) {
  const scope = requireArea(context, "imports");
  const parsed = undoForm.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    return data({ ok: false as const, message: `${issue?.path.join(".")}: ${issue?.message}` }, { status: 400 });
  }
  const result = await undoBatch(scope, parsed.data.batchId);
  if (!result.ok) return data({ ok: false as const, message: result.message }, { status: result.status });
  return {
    ok: true as const,
    message: `Import ${parsed.data.batchId} undone: ${formatCount(result.tests)} water tests and ${formatCount(result.treatments)} treatments removed.`,
  };
}

const PHASE_WORDS: Record<string, string> = {
  uploaded: "waiting for a check",
  checking: "being checked",
  checked: "checked, not imported yet",
  committing: "being imported",
  failed: "stopped; nothing stored",
};

export default function Imports({ loaderData, actionData }: Route.ComponentProps) {
  const { batches, uploads, timeZone } = loaderData;
  const navigation = useNavigation();
  return (
    <div className="space-y-8">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h1 className="text-2xl font-semibold tracking-tight">Imports</h1>
          <p className="text-muted">Past logs brought into Patina, newest first. Each import can be taken back whole.</p>
        </div>
        <Link to="/imports/new" className="rounded-lg bg-verdigris-700 px-4 py-2 font-medium text-white hover:bg-verdigris-900">
          Upload a log
        </Link>
      </div>
      {actionData ? (
        <p role={actionData.ok ? "status" : "alert"} className={`rounded-lg border bg-white p-3 text-sm ${actionData.ok ? "border-line" : "border-alert text-alert"}`}>
          {actionData.message}
        </p>
      ) : null}

      <section aria-labelledby="open-uploads">
        <h2 id="open-uploads" className="mb-2 text-lg font-semibold">Files not imported yet</h2>
        {uploads.length === 0 ? (
          <p className="rounded-xl border border-line bg-white p-4 text-muted">No file is waiting: every upload has been imported or set aside.</p>
        ) : (
          <ul className="divide-y divide-line rounded-xl border border-line bg-white">
            {uploads.map((u) => (
              <li key={u.id} className="flex flex-wrap items-center justify-between gap-2 px-4 py-3">
                <TextLink to={`/imports/${u.id}`}>{u.fileName}</TextLink>
                <span className="text-sm text-muted">
                  {PHASE_WORDS[u.phase] ?? u.phase} · {formatCount(u.rowsTotal ?? 0)} rows · {formatDateTime(u.createdAt, timeZone)}
                </span>
              </li>
            ))}
          </ul>
        )}
      </section>

      <section aria-labelledby="history">
        <h2 id="history" className="mb-2 text-lg font-semibold">Import history</h2>
        {batches.length === 0 ? (
          <p className="rounded-xl border border-line bg-white p-4 text-muted">Nothing has been imported yet. Upload a log to bring past tests in.</p>
        ) : (
          <ul className="space-y-3" aria-label="Imports, newest first">
            {batches.map((b) => (
              <li key={b.id} className="rounded-xl border border-line bg-white p-4">
                <div className="flex flex-wrap items-start justify-between gap-2">
                  <div>
                    <p className="font-medium">{b.fileName}</p>
                    <p className="text-sm text-muted">
                      {b.userName ?? "someone no longer on the team"} · {formatDateTime(b.createdAt, timeZone)}
                    </p>
                  </div>
                  {b.status === "undone" ? (
                    <span className="rounded-full bg-paper px-3 py-1 text-sm text-muted">undone {formatDateTime(b.undoneAt, timeZone)}</span>
                  ) : (
                    <Form
                      method="post"
                      onSubmit={(event) => {
                        if (!confirm(`Remove the ${b.testsAdded} tests and ${b.treatmentsAdded} treatments of "${b.fileName}"?`)) event.preventDefault();
                      }}
                    >
                      <input type="hidden" name="intent" value="undo" />
                      <input type="hidden" name="batchId" value={b.id} />
                      <button
                        type="submit"
                        disabled={navigation.state !== "idle"}
                        className="rounded-lg border border-line px-3 py-1 font-medium hover:bg-verdigris-50"
                        aria-label={`Undo the import of ${b.fileName}`}
                      >
                        Undo
                      </button>
                    </Form>
                  )}
                </div>
                <dl className="mt-3 grid grid-cols-2 gap-2 text-sm tabular-nums sm:grid-cols-4">
                  <div><dt className="text-muted">Tests added</dt><dd className="font-medium">{formatCount(b.testsAdded)}</dd></div>
                  <div><dt className="text-muted">Treatments added</dt><dd className="font-medium">{formatCount(b.treatmentsAdded)}</dd></div>
                  <div><dt className="text-muted">Already stored</dt><dd className="font-medium">{formatCount(b.rowsDuplicate)}</dd></div>
                  <div><dt className="text-muted">Refused</dt><dd className="font-medium">{formatCount(b.rowsRefused)}</dd></div>
                </dl>
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
