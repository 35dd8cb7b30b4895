import { requireArea } from "~/.server/guard";
import { pendingInvitations } from "~/.server/team/invitations";
import { companyMembers } from "~/.server/team/queries/members";
import { InvitePanel } from "~/components/mail/invite-panel";
import { formatDate } from "~/lib/format";
import { ROLE_LABELS } from "~/lib/roles";
import type { Route } from "./+types/team";

export const meta: Route.MetaFunction = () => [{ title: "Team · Patina" }];

export async function loader({ context }: Route.LoaderArgs) {
  const scope = requireArea(context, "team");
  return { members: await companyMembers(scope), invitations: await pendingInvitations(scope), timeZone: scope.timeZone };
}

export default function Team({ loaderData }: Route.ComponentProps) {
  const { members, invitations, timeZone } = loaderData;
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-semibold tracking-tight">Team</h1>
      <ul className="divide-y divide-line rounded-xl border border-line bg-white">
        {members.map((m) => (
          <li key={m.userId} className="flex flex-wrap items-center justify-between gap-2 px-4 py-3">
            <span>
              <span className="block font-medium">{m.name}</span>
              <span className="block text-sm text-muted">{m.email}</span>
            </span>
            <span className="text-sm">
              <span className="rounded-full bg-verdigris-100 px-2 py-1 font-medium text-verdigris-900">{ROLE_LABELS[m.role]}</span>
              <span className="ml-2 text-muted">since {formatDate(m.since, timeZone)}</span>
            </span>
          </li>
        ))}
      </ul>
      <InvitePanel pending={invitations} timeZone={timeZone} />
    </div>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
