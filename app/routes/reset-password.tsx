import { APIError } from "better-auth/api";
import { data } from "react-router";
import { z } from "zod";
import { auth } from "~/.server/auth";
import { NewPasswordFields, PublicCard, PublicForm, PublicNotice } from "~/components/mail/public-card";
import { TextLink } from "~/components/text-link";
import { fieldErrorsOf, newPasswordFields, passwordMismatch, passwordsMatch } from "~/lib/account-forms";
import type { Route } from "./+types/reset-password";

export const meta: Route.MetaFunction = () => [{ title: "Choose a new password · Patina" }];

const resetSchema = z
  .object({ token: z.string().min(1, { error: "The link has no token; open the link from the e-mail again." }), ...newPasswordFields })
  .refine(passwordsMatch, passwordMismatch);

export async function loader({ request }: Route.LoaderArgs) {
  return { token: new URL(request.url).searchParams.get("token") ?? "" };
}

export async function action({ request }: Route.ActionArgs) {
  const parsed = resetSchema.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) {
    const fieldErrors = fieldErrorsOf(parsed.error.issues);
    return data({ done: false, fieldErrors, formError: fieldErrors.token ?? null }, { status: 400 });
  }
  try {
    await auth().api.resetPassword({ body: { token: parsed.data.token, newPassword: parsed.data.password } });
  } catch (error) {
    if (error instanceof APIError) {
      return data(
        { done: false, fieldErrors: {}, formError: "This link has expired or was already used. Ask for a new one." },
        { status: 410 },
      );
    }
    throw error;
  }
  return { done: true, fieldErrors: {}, formError: null };
}

export default function ResetPassword({ loaderData, actionData }: Route.ComponentProps) {
  if (actionData?.done) {
    const message = "Your new password is set, and every earlier session is signed out.";
    return <PublicNotice title="Password changed" message={message} next={{ to: "/sign-in", label: "Sign in" }} />;
  }
  if (!loaderData.token) {
    const message = "This page needs the link from the e-mail.";
    return <PublicNotice title="Choose a new password" message={message} next={{ to: "/forgot-password", label: "Ask for a new link" }} />;
  }
  const fieldErrors: Record<string, string | undefined> = actionData?.fieldErrors ?? {};
  return (
    <PublicCard title="Choose a new password">
      <PublicForm formError={actionData?.formError} submit="Save the new password" busyText="Saving…">
        <input type="hidden" name="token" value={loaderData.token} />
        <NewPasswordFields label="New password" errors={fieldErrors} />
      </PublicForm>
      {actionData?.formError ? (
        <p className="text-sm">
          <TextLink to="/forgot-password">Ask for a new link</TextLink>
        </p>
      ) : null}
    </PublicCard>
  );
}

export { ErrorPage as ErrorBoundary } from "~/components/error-panel";
