import { data } from "react-router";
import { z } from "zod";
import { requireArea } from "~/.server/guard";
import { plainId } from "~/lib/strict-params";
import { inviteMember, withdrawInvitation } from "~/.server/team/invitations";
import { fieldErrorsOf } from "~/lib/account-forms";
import { ROLE_NAMES } from "~/lib/roles";
import type { Route } from "./+types/team.invitations";

const inviteSchema = z.discriminatedUnion("intent", [
  z.object({
    intent: z.literal("invite"),
    email: z.email({ error: "Enter the e-mail address of the person to invite." }).max(255),
    role: z.enum(ROLE_NAMES, { error: `Choose a role: ${ROLE_NAMES.join(", ")}.` }),
  }),
  z.object({
    intent: z.literal("withdraw"),
    invitationId: plainId("invitationId"),
  }),
]);

/** Sending and withdrawing invitations from the team page (owners only). */
export async function action({ request, context }: Route.ActionArgs) {
  const scope = requireArea(context, "team");
  const parsed = inviteSchema.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) return data({ ok: false as const, fieldErrors: fieldErrorsOf(parsed.error.issues) }, { status: 400 });
  if (parsed.data.intent === "withdraw") {
    const withdrawn = await withdrawInvitation(scope, parsed.data.invitationId);
    if (!withdrawn) throw data("No pending invitation with that number in your company.", { status: 404 });
    return { ok: true as const, fieldErrors: {}, invited: null };
  }
  const result = await inviteMember(scope, { email: parsed.data.email, role: parsed.data.role });
  if (!result.ok) return data({ ok: false as const, fieldErrors: { [result.field]: result.message } }, { status: 409 });
  return { ok: true as const, fieldErrors: {}, invited: parsed.data.email };
}

export async function loader() {
  throw data("Invitations are sent from the team page (POST only).", { status: 405, headers: { Allow: "POST" } });
}
