import { Link } from "react-router";
import { requireArea } from "~/.server/guard";
import { outboxMessages } from "~/.server/mail/mailbox";
import { MailStatusBadge } from "~/components/mail/mail-status";
import { formatDateTime } from "~/lib/format";
import type { Route } from "./+types/mailbox";

export const meta: Route.MetaFunction = () => [{ title: "Mailbox · Patina" }];

export async function loader({ context }: Route.LoaderArgs) {
  const scope = requireArea(context, "mailbox");
  return { messages: await outboxMessages(scope), timeZone: scope.timeZone };
}

export default function Mailbox({ loaderData }: Route.ComponentProps) {
  const { messages, timeZone } = loaderData;
  return (
    <div className="space-y-4">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">Mailbox</h1>
        <p className="text-sm text-muted">
          Every e-mail Patina sent or is about to send for your company: invitations, password links, alerts and digests. Messages
          that could not be delivered are tried again on their own.
        </p>
      </div>
      {messages.length === 0 ? (
        <p className="rounded-xl border border-line bg-white p-4 text-muted">
          Nothing has been sent yet. Invitations from the team page, metal alerts and the weekly digest appear here.
        </p>
      ) : (
        <ul className="divide-y divide-line rounded-xl border border-line bg-white">
          {messages.map((m) => (
            <li key={m.id}>
              <Link to={`/mailbox/${m.id}`} className="flex flex-wrap items-center justify-between gap-2 px-4 py-3 hover:bg-verdigris-50">
                <span className="min-w-0">
                  <span className="block truncate font-medium">{m.subject}</span>
                  <span className="block text-sm text-muted">
                    to {m.recipient} · {formatDateTime(m.createdAt, timeZone)}
                  </span>
                </span>
                <MailStatusBadge status={m.status} attempts={m.attempts} />
              </Link>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
