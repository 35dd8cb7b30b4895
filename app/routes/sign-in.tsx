import { data, Form, redirect } from "react-router";
import { z } from "zod";
import { currentUser } from "~/.server/guard";
import { signInWithThrottle } from "~/.server/security/sign-in-throttle";
import { PublicSubmit, TextField } from "~/components/mail/public-card";
import { PatinaMark } from "~/components/patina-mark";
import { TextLink } from "~/components/text-link";
import { safeNext } from "~/lib/safe-next";
import type { Route } from "./+types/sign-in";

export const meta: Route.MetaFunction = () => [{ title: "Sign in · Patina" }];

const signInSchema = z.object({
  email: z.email({ error: "Enter the e-mail address you were invited with." }),
  password: z.string().min(1, { error: "Enter your password." }),
  next: z.string().optional(),
});

export async function loader({ request }: Route.LoaderArgs) {
  const next = safeNext(new URL(request.url).searchParams.get("next"));
  if (await currentUser(request)) throw redirect(next);
  return { next };
}

export async function action({ request, context }: Route.ActionArgs) {
  const parsed = signInSchema.safeParse(Object.fromEntries(await request.formData()));
  if (!parsed.success) {
    const fieldErrors: Record<string, string> = {};
    for (const issue of parsed.error.issues) fieldErrors[String(issue.path[0])] ??= issue.message;
    return data({ fieldErrors, formError: null }, { status: 400 });
  }
  const outcome = await signInWithThrottle(request, context, parsed.data.email, parsed.data.password);
  if (outcome.ok) {
    const headers = new Headers();
    for (const cookie of outcome.cookies) headers.append("Set-Cookie", cookie);
    return redirect(safeNext(parsed.data.next), { headers });
  }
  if (outcome.status === 429) {
    return data(
      { fieldErrors: {}, formError: outcome.message },
      { status: 429, headers: { "Retry-After": String(outcome.retryAfterSeconds) } },
    );
  }
  return data({ fieldErrors: {}, formError: "That e-mail and password do not match an account." }, { status: 401 });
}

export default function SignIn({ loaderData, actionData }: Route.ComponentProps) {
  const fieldErrors: Record<string, string | undefined> = actionData?.fieldErrors ?? {};
  return (
    <main className="mx-auto flex min-h-dvh max-w-sm flex-col justify-center px-5 py-10">
      <div className="mb-8 flex items-center gap-3">
        <PatinaMark className="size-10" />
        <div>
          <p className="text-2xl font-semibold tracking-tight">Patina</p>
          <p className="text-sm text-muted">Water records and metal tracking for pool routes</p>
        </div>
      </div>
      <Form method="post" className="space-y-4 rounded-2xl border border-line bg-white p-6 shadow-sm" noValidate>
        <h1 className="text-lg font-semibold">Sign in</h1>
        <input type="hidden" name="next" value={loaderData.next} />
        <TextField name="email" label="E-mail" type="email" autoComplete="username" error={fieldErrors.email} />
        <TextField name="password" label="Password" type="password" autoComplete="current-password" error={fieldErrors.password} />
        <PublicSubmit formError={actionData?.formError} busyText="Signing in…">
          Sign in
        </PublicSubmit>
        <p className="text-center text-sm">
          <TextLink to="/forgot-password">Forgot your password?</TextLink>
        </p>
      </Form>
    </main>
  );
}
