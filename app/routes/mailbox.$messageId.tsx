import { data, Form, Link, type RouterContextProvider } from "react-router";
import { z } from "zod";
import { requireArea } from "~/.server/guard";
import { plainId } from "~/lib/strict-params";
import { outboxMessage } from "~/.server/mail/mailbox";
import { retryMessage, signalMailQueued } from "~/.server/mail/outbox";
import { MailStatusBadge } from "~/components/mail/mail-status";
import { formatDateTime } from "~/lib/format";
import type { Route } from "./+types/mailbox.$messageId";

export const meta: Route.MetaFunction = ({ data }) => [{ title: `${data?.message.subject ?? "Message"} · Mailbox · Patina` }];

const messageParams = z.object({
  messageId: plainId("messageId"),
});

async function findMessage(context: Readonly<RouterContextProvider>, params: unknown) {
  const scope = requireArea(context, "mailbox");
  const parsed = messageParams.safeParse(params);
  if (!parsed.success) throw data(parsed.error.issues[0]!.message, { status: 400 });
  const message = await outboxMessage(scope, parsed.data.messageId);
  if (!message) throw data("There is no message with that number in your company's mailbox.", { status: 404 });
  return { scope, message };
}

export async function loader({ params, context }: Route.LoaderArgs) {
  const { scope, message } = await findMessage(context, params);
  return { message, timeZone: scope.timeZone };
}

/** Puts a message that was given up on back into the queue. */
export async function action({ params, context }: Route.ActionArgs) {
  const { scope, message } = await findMessage(context, params);
  const queued = await retryMessage(scope.companyId, message.id);
  if (!queued) throw data("Only a message that could not be delivered can be sent again.", { status: 409 });
  signalMailQueued();
  return { queued };
}

export default function MailboxMessage({ loaderData }: Route.ComponentProps) {
  const { message, timeZone } = loaderData;
  return (
    <div className="space-y-4">
      <p>
        <Link to="/mailbox" className="text-sm font-medium text-verdigris-700 underline">
          ← Mailbox
        </Link>
      </p>
      <h1 className="text-2xl font-semibold tracking-tight">{message.subject}</h1>
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 rounded-xl border border-line bg-white p-4 text-sm">
        <dt className="text-muted">To</dt>
        <dd>{message.recipient}</dd>
        <dt className="text-muted">Queued</dt>
        <dd>{formatDateTime(message.createdAt, timeZone)}</dd>
        <dt className="text-muted">Status</dt>
        <dd>
          <MailStatusBadge status={message.status} attempts={message.attempts} />
          {message.sentAt ? <span className="ml-2">sent {formatDateTime(message.sentAt, timeZone)}</span> : null}
          {message.status === "pending" && message.attempts > 0 ? (
            <span className="ml-2">next try {formatDateTime(message.nextAttemptAt, timeZone)}</span>
          ) : null}
        </dd>
        {message.lastError ? (
          <>
            <dt className="text-muted">Last error</dt>
            <dd className="break-words text-alert">{message.lastError}</dd>
          </>
        ) : null}
      </dl>
      {message.status === "failed" ? (
        <Form method="post">
          <button type="submit" className="rounded-lg bg-verdigris-700 px-4 py-2 font-semibold text-white hover:bg-verdigris-900">
            Send it again
          </button>
        </Form>
      ) : null}
      <section aria-labelledby="html-heading" className="space-y-2">
        <h2 id="html-heading" className="text-lg font-semibold">
          As the recipient sees it
        </h2>
        {/* sandbox without permissions: the message's HTML cannot run scripts or reach this page. */}
        <iframe title="The message as HTML" sandbox="" srcDoc={message.html} className="h-[32rem] w-full rounded-xl border border-line bg-white" />
      </section>
      <section aria-labelledby="text-heading" className="space-y-2">
        <h2 id="text-heading" className="text-lg font-semibold">
          Plain-text part
        </h2>
        <pre className="overflow-x-auto whitespace-pre-wrap rounded-xl border border-line bg-white p-4 text-sm">{message.text}</pre>
      </section>
    </div>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
