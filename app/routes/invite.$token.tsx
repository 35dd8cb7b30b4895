import { data, redirect } from "react-router";
import { z } from "zod";
import { auth } from "~/.server/auth";
import { acceptInvitation, invitationByToken } from "~/.server/team/invitations";
import { NewPasswordFields, PublicCard, PublicForm, PublicNotice, TextField } from "~/components/mail/public-card";
import { fieldErrorsOf, newPasswordFields, passwordMismatch, passwordsMatch } from "~/lib/account-forms";
import { ROLE_LABELS } from "~/lib/roles";
import type { Route } from "./+types/invite.$token";

export const meta: Route.MetaFunction = () => [{ title: "Join your team · Patina" }];

const tokenParams = z.object({ token: z.string().regex(/^[A-Za-z0-9_-]{20,100}$/, { error: "not an invitation link" }) });

const acceptSchema = z
  .object({
    name: z.string().trim().min(1, { error: "Enter your name as your team should see it." }).max(200, { error: "Use at most 200 characters." }),
    ...newPasswordFields,
  })
  .refine(passwordsMatch, passwordMismatch);

export async function loader({ params }: Route.LoaderArgs) {
  const parsed = tokenParams.safeParse(params);
  if (!parsed.success) return { invitation: { state: "unknown" as const } };
  const invitation = await invitationByToken(parsed.data.token);
  return {
    invitation:
      invitation.state === "open"
        ? { ...invitation, roleLabel: ROLE_LABELS[invitation.role], expiresAt: invitation.expiresAt.toISOString() }
        : invitation,
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const token = tokenParams.safeParse(params);
  if (!token.success) return data({ fieldErrors: {}, formError: "This invitation link is not valid." }, { status: 404 });
  const parsed = acceptSchema.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) return data({ fieldErrors: fieldErrorsOf(parsed.error.issues), formError: null }, { status: 400 });

  const accepted = await acceptInvitation(token.data.token, parsed.data);
  if (!accepted.ok) {
    const status = accepted.reason === "unknown" ? 404 : accepted.reason === "account_exists" ? 409 : 410;
    return data({ fieldErrors: {}, formError: accepted.message }, { status });
  }
  const signedIn = await auth().api.signInEmail({
    body: { email: accepted.email, password: parsed.data.password },
    headers: request.headers,
    asResponse: true,
  });
  if (!signedIn.ok) return redirect("/sign-in");
  const headers = new Headers();
  for (const cookie of signedIn.headers.getSetCookie()) headers.append("Set-Cookie", cookie);
  return redirect("/", { headers });
}

const closedMessages = {
  unknown: "This invitation link is not valid. Ask the person who invited you for a new one.",
  expired: "This invitation has expired. Ask the person who invited you for a new one.",
  used: "This invitation has already been used.",
} as const;

export default function Invite({ loaderData, actionData }: Route.ComponentProps) {
  const { invitation } = loaderData;
  if (invitation.state !== "open") {
    return <PublicNotice title="Invitation" message={closedMessages[invitation.state]} next={{ to: "/sign-in", label: "Go to sign-in" }} />;
  }
  const fieldErrors: Record<string, string | undefined> = actionData?.fieldErrors ?? {};
  return (
    <PublicCard title={`Join ${invitation.companyName}`}>
      <p className="text-sm text-muted">
        You are invited as <strong className="text-ink">{invitation.roleLabel.toLowerCase()}</strong> with the address{" "}
        <strong className="text-ink">{invitation.email}</strong>. Choose your name and a password.
      </p>
      <PublicForm formError={actionData?.formError} submit="Join and sign in" busyText="Creating your account…">
        <TextField name="name" label="Your name" autoComplete="name" error={fieldErrors.name} />
        <NewPasswordFields label="Password" errors={fieldErrors} />
      </PublicForm>
    </PublicCard>
  );
}

export { ErrorPage as ErrorBoundary } from "~/components/error-panel";
