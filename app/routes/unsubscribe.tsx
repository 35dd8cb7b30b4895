import { data, Form, Link } from "react-router";
import { z } from "zod";
import { unsubscribeFromDigest } from "~/.server/mail/preferences";
import { ErrorPanel } from "~/components/error-panel";
import { primaryButton, PublicCard } from "~/components/mail/public-card";
import type { Route } from "./+types/unsubscribe";

export const meta: Route.MetaFunction = () => [{ title: "Weekly digest · Patina" }];

const tokenParams = z.object({ token: z.string().regex(/^[A-Za-z0-9_-]{16,64}$/, { error: "not an unsubscribe link" }) });

export async function loader({ params }: Route.LoaderArgs) {
  return { valid: tokenParams.safeParse(params).success };
}

/**
 * The digest is turned off by a button press, not by opening the link, so a
 * mail scanner that follows links cannot unsubscribe anybody.
 */
export async function action({ params }: Route.ActionArgs) {
  const parsed = tokenParams.safeParse(params);
  const result = parsed.success ? await unsubscribeFromDigest(parsed.data.token) : { ok: false as const };
  if (!result.ok) return data({ done: false as const, email: null }, { status: 404 });
  return { done: true as const, email: result.email, companyName: result.companyName };
}

export default function Unsubscribe({ loaderData, actionData }: Route.ComponentProps) {
  if (actionData?.done) {
    return (
      <PublicCard title="Weekly digest turned off">
        <p>
          {actionData.email} will no longer get the weekly digest from {actionData.companyName}. Alerts about metal in pools still
          arrive.
        </p>
      </PublicCard>
    );
  }
  if (!loaderData.valid || actionData?.done === false) {
    return (
      <PublicCard title="Weekly digest">
        <p>This unsubscribe link is not valid. Use the link from your most recent digest.</p>
        <Link to="/sign-in" className="font-medium text-verdigris-700 underline">
          Go to sign-in
        </Link>
      </PublicCard>
    );
  }
  return (
    <PublicCard title="Stop the weekly digest?">
      <p>You will no longer get the Monday summary of open metal cases, recurring pools and treatment results.</p>
      <Form method="post">
        <button type="submit" className={primaryButton}>
          Stop the weekly digest
        </button>
      </Form>
    </PublicCard>
  );
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return (
    <main className="mx-auto max-w-xl p-6">
      <ErrorPanel error={error} />
    </main>
  );
}
