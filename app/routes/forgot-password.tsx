import { data } from "react-router";
import { z } from "zod";
import { requestPasswordReset } from "~/.server/mail/reset-request";
import { PublicCard, PublicForm, PublicNotice, TextField } from "~/components/mail/public-card";
import { TextLink } from "~/components/text-link";
import { fieldErrorsOf } from "~/lib/account-forms";
import type { Route } from "./+types/forgot-password";

export const meta: Route.MetaFunction = () => [{ title: "Forgot your password · Patina" }];

const requestSchema = z.object({
  email: z.email({ error: "Enter the e-mail address you sign in with." }),
});

export async function action({ request, context }: Route.ActionArgs) {
  const parsed = requestSchema.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) {
    return data({ sent: false, fieldErrors: fieldErrorsOf(parsed.error.issues), formError: null }, { status: 400 });
  }
  const outcome = await requestPasswordReset(request, context, parsed.data.email);
  if (outcome.status === "rate_limited") {
    const minutes = Math.max(1, Math.ceil(outcome.retryAfterSeconds / 60));
    return data(
      { sent: false, fieldErrors: {}, formError: `Too many requests for this account or from this network. Try again in ${minutes} minute${minutes === 1 ? "" : "s"}.` },
      { status: 429, headers: { "Retry-After": String(outcome.retryAfterSeconds) } },
    );
  }
  return { sent: true, fieldErrors: {}, formError: null };
}

export default function ForgotPassword({ actionData }: Route.ComponentProps) {
  if (actionData?.sent) {
    const message = "If an account uses that address, a link to choose a new password is on its way. It works for one hour.";
    return <PublicNotice title="Check your e-mail" message={message} next={{ to: "/sign-in", label: "Back to sign-in" }} />;
  }
  const fieldErrors: Record<string, string | undefined> = actionData?.fieldErrors ?? {};
  return (
    <PublicCard title="Forgot your password?">
      <p className="text-sm text-muted">Enter the address you sign in with; we e-mail you a link to choose a new password.</p>
      <PublicForm formError={actionData?.formError} submit="Send the link" busyText="Sending…">
        <TextField name="email" label="E-mail" type="email" autoComplete="username" error={fieldErrors.email} />
      </PublicForm>
      <p className="text-sm">
        <TextLink to="/sign-in">Back to sign-in</TextLink>
      </p>
    </PublicCard>
  );
}

export { ErrorPage as ErrorBoundary } from "~/components/error-panel";
