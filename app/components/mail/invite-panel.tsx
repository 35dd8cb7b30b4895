import { useEffect, useRef } from "react";
import { useFetcher } from "react-router";
import { OptionList, SubmitButton } from "~/components/form-controls";
import { formatDate } from "~/lib/format";
import { ROLE_LABELS, ROLE_NAMES, type RoleName } from "~/lib/roles";

type Pending = { id: number; email: string; role: RoleName; expiresAt: Date | string };
const ROLE_OPTIONS = ROLE_NAMES.map((role) => ({ value: role, label: ROLE_LABELS[role] }));

type InviteAnswer = { ok: boolean; fieldErrors: Record<string, string>; invited?: string | null };

/** The owner's form for inviting people by e-mail, and the invitations still open. */
export function InvitePanel({ pending, timeZone }: { pending: Pending[]; timeZone: string }) {
  const invite = useFetcher<InviteAnswer>();
  const formRef = useRef<HTMLFormElement>(null);
  const errors = invite.data?.fieldErrors ?? {};
  const busy = invite.state !== "idle";
  useEffect(() => {
    if (invite.state === "idle" && invite.data?.ok) formRef.current?.reset();
  }, [invite.state, invite.data]);

  return (
    <section aria-labelledby="invite-heading" className="space-y-4 rounded-xl border border-line bg-white p-4">
      <h2 id="invite-heading" className="text-lg font-semibold">
        Invite someone
      </h2>
      <invite.Form ref={formRef} method="post" action="/team/invitations" className="grid gap-3 sm:grid-cols-[1fr_12rem_auto] sm:items-end" noValidate>
        <input type="hidden" name="intent" value="invite" />
        <label className="block">
          <span className="text-sm font-medium">E-mail</span>
          <input
            name="email"
            type="email"
            required
            aria-invalid={Boolean(errors.email)}
            aria-describedby={errors.email ? "invite-email-error" : undefined}
            className="mt-1 block w-full rounded-lg border border-line px-3 py-3 text-base"
          />
        </label>
        <label className="block">
          <span className="text-sm font-medium">Role</span>
          <select name="role" defaultValue="technician" className="mt-1 block w-full rounded-lg border border-line bg-white px-3 py-3 text-base">
            <OptionList options={ROLE_OPTIONS} />
          </select>
        </label>
        <SubmitButton busy={busy} busyText="Sending…" className="rounded-lg bg-verdigris-700 px-4 py-3 font-semibold text-white hover:bg-verdigris-900 disabled:opacity-60">
          Send invitation
        </SubmitButton>
      </invite.Form>
      {errors.email || errors.role ? (
        <p id="invite-email-error" role="alert" className="text-sm text-alert">
          {errors.email ?? errors.role}
        </p>
      ) : null}
      <p role="status" className="text-sm text-muted">
        {invite.data?.ok && invite.data.invited ? `Invitation sent to ${invite.data.invited}. The link works once, for 7 days.` : null}
      </p>
      <h3 className="text-sm font-semibold text-muted">Open invitations</h3>
      {pending.length === 0 ? (
        <p className="text-sm text-muted">No invitations are waiting for an answer.</p>
      ) : (
        <ul className="divide-y divide-line">
          {pending.map((p) => (
            <li key={p.id} className="flex flex-wrap items-center justify-between gap-2 py-2 text-sm">
              <span>
                <span className="font-medium">{p.email}</span> · {ROLE_LABELS[p.role]}
                <span className="block text-muted">link works until {formatDate(p.expiresAt, timeZone)}</span>
              </span>
              <WithdrawButton id={p.id} />
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}

function WithdrawButton({ id }: { id: number }) {
  const withdraw = useFetcher();
  return (
    <withdraw.Form method="post" action="/team/invitations">
      <input type="hidden" name="intent" value="withdraw" />
      <input type="hidden" name="invitationId" value={id} />
      <button type="submit" className="rounded-lg border border-line px-3 py-2 font-medium hover:bg-verdigris-50">
        Withdraw
      </button>
    </withdraw.Form>
  );
}
