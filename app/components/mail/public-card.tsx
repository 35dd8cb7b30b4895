import type { ReactNode } from "react";
import { Form, useNavigation } from "react-router";
import { FormProblem, SubmitButton } from "~/components/form-controls";
import { PatinaMark } from "~/components/patina-mark";
import { TextLink } from "~/components/text-link";

/** The frame of the pages people reach from an e-mail link, before or without signing in. */
export function PublicCard({ title, children }: { title: string; children: ReactNode }) {
  return (
    <main className="mx-auto flex min-h-dvh max-w-md flex-col justify-center px-5 py-10">
      <div className="mb-8 flex items-center gap-3">
        <PatinaMark className="size-10" />
        <p className="text-2xl font-semibold tracking-tight">Patina</p>
      </div>
      <section className="space-y-4 rounded-2xl border border-line bg-white p-6 shadow-sm">
        <h1 className="text-lg font-semibold">{title}</h1>
        {children}
      </section>
    </main>
  );
}

/** A public page that only tells how things stand (sent, done, closed) and where to go next. */
export function PublicNotice({ title, message, next }: { title: string; message: ReactNode; next?: { to: string; label: string } }) {
  return (
    <PublicCard title={title}>
      <p>{message}</p>
      {next ? (
        <p>
          <TextLink to={next.to}>{next.label}</TextLink>
        </p>
      ) : null}
    </PublicCard>
  );
}

export function TextField(props: {
  name: string;
  label: string;
  type?: "text" | "email" | "password";
  autoComplete?: string;
  error?: string;
  hint?: string;
  defaultValue?: string;
}) {
  const inputId = `field-${props.name}`;
  const errorId = `${props.name}-error`;
  const hintId = `${props.name}-hint`;
  const describedBy = [props.error ? errorId : null, props.hint ? hintId : null].filter(Boolean).join(" ") || undefined;
  // Hint and error sit outside the label, so the field's name stays just its label.
  return (
    <div>
      <label htmlFor={inputId} className="text-sm font-medium">
        {props.label}
      </label>
      <input
        id={inputId}
        name={props.name}
        type={props.type ?? "text"}
        autoComplete={props.autoComplete}
        defaultValue={props.defaultValue}
        required
        aria-invalid={Boolean(props.error)}
        aria-describedby={describedBy}
        className="mt-1 block w-full rounded-lg border border-line px-3 py-3 text-base"
      />
      {props.hint ? (
        <span id={hintId} className="mt-1 block text-sm text-muted">
          {props.hint}
        </span>
      ) : null}
      {props.error ? (
        <span id={errorId} className="mt-1 block text-sm text-alert">
          {props.error}
        </span>
      ) : null}
    </div>
  );
}

/** The password and its repetition, for a new account or a new password. */
export function NewPasswordFields({ label, errors }: { label: string; errors: Record<string, string | undefined> }) {
  return (
    <>
      <TextField name="password" label={label} type="password" autoComplete="new-password" hint="At least 12 characters." error={errors.password} />
      <TextField name="confirm" label={`${label} again`} type="password" autoComplete="new-password" error={errors.confirm} />
    </>
  );
}

export const primaryButton =
  "w-full rounded-lg bg-verdigris-700 px-4 py-3 font-semibold text-white hover:bg-verdigris-900 disabled:opacity-60";

/** The end of a public form: its problem, if any, then the full-width submit button, saying `busyText` while the post runs. */
export function PublicSubmit({ formError, busyText, children }: { formError: string | null | undefined; busyText: string; children: ReactNode }) {
  const busy = useNavigation().state !== "idle";
  return (
    <>
      <FormProblem message={formError} />
      <SubmitButton busy={busy} busyText={busyText} className={primaryButton}>
        {children}
      </SubmitButton>
    </>
  );
}

/** A public page's form: posted to the page's action, its fields (`children`), then `PublicSubmit`. */
export function PublicForm({ formError, submit, busyText, children }: { formError: string | null | undefined; submit: string; busyText: string; children: ReactNode }) {
  return (
    <Form method="post" className="space-y-4" noValidate>
      {children}
      <PublicSubmit formError={formError} busyText={busyText}>
        {submit}
      </PublicSubmit>
    </Form>
  );
}
