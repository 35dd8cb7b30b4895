import { data, Form } from "react-router";
import { z } from "zod";
import { unsubscribeFromDigest } from "~/.server/mail/preferences";
import { primaryButton, PublicCard, PublicNotice } from "~/components/mail/public-card";
import type { Route } from "./+types/unsubscribe.$token";

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
      <PublicNotice
        title="Weekly digest turned off"
        message={`${actionData.email} will no longer get the weekly digest from ${actionData.companyName}. Alerts about metal in pools still arrive.`}
      />
    );
  }
  if (!loaderData.valid || actionData?.done === false) {
    return (
      <PublicNotice
        title="Weekly digest"
        message="This unsubscribe link is not valid. Use the link from your most recent digest."
        next={{ to: "/sign-in", label: "Go to sign-in" }}
      />
    );
  }
  return (
    <PublicCard title="Stop the weekly digest?">
      <p>You will no longer get the Monday summary of open metal episodes, recurring pools and treatment results.</p>
      <Form method="post">
        <button type="submit" className={primaryButton}>
          Stop the weekly digest
        </button>
      </Form>
    </PublicCard>
  );
}

export { ErrorPage as ErrorBoundary } from "~/components/error-panel";
