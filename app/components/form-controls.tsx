import type { ReactNode } from "react";
import type { FieldErrors } from "~/lib/forms/fields";

const inputClass =
  "mt-1 block w-full rounded-lg border border-line bg-white px-3 py-3 text-base aria-[invalid=true]:border-alert";

type Common = { name: string; label: string; errors?: FieldErrors; hint?: ReactNode; className?: string };

function ErrorText({ name, errors }: { name: string; errors?: FieldErrors }) {
  const message = errors?.[name];
  return message ? (
    <span id={`${name}-error`} className="mt-1 block text-sm text-alert">
      {message}
    </span>
  ) : null;
}

function describedBy(name: string, errors?: FieldErrors, hint?: ReactNode) {
  const ids = [errors?.[name] ? `${name}-error` : null, hint ? `${name}-hint` : null].filter(Boolean);
  return ids.length > 0 ? ids.join(" ") : undefined;
}

/** The label around a control, with its hint and error below it. */
function Field({ name, label, errors, hint, className, children }: Common & { children: ReactNode }) {
  return (
    <label className={`block ${className ?? ""}`}>
      <span className="text-sm font-medium">{label}</span>
      {children}
      {hint ? (
        <span id={`${name}-hint`} className="mt-1 block text-xs text-muted">
          {hint}
        </span>
      ) : null}
      <ErrorText name={name} errors={errors} />
    </label>
  );
}

export function TextField({
  name,
  label,
  errors,
  hint,
  className,
  ...input
}: Common & Omit<React.InputHTMLAttributes<HTMLInputElement>, "name">) {
  return (
    <Field name={name} label={label} errors={errors} hint={hint} className={className}>
      <input
        name={name}
        aria-invalid={Boolean(errors?.[name])}
        aria-describedby={describedBy(name, errors, hint)}
        className={inputClass}
        {...input}
      />
    </Field>
  );
}

export function SelectField({
  name,
  label,
  errors,
  hint,
  className,
  options,
  placeholder,
  ...select
}: Common & {
  options: ReadonlyArray<{ value: string; label: string }>;
  placeholder?: string;
} & Omit<React.SelectHTMLAttributes<HTMLSelectElement>, "name">) {
  return (
    <Field name={name} label={label} errors={errors} hint={hint} className={className}>
      <select
        name={name}
        aria-invalid={Boolean(errors?.[name])}
        aria-describedby={describedBy(name, errors, hint)}
        className={inputClass}
        {...select}
      >
        {placeholder !== undefined ? <option value="">{placeholder}</option> : null}
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </Field>
  );
}

export function TextAreaField({
  name,
  label,
  errors,
  className,
  ...area
}: Common & Omit<React.TextareaHTMLAttributes<HTMLTextAreaElement>, "name">) {
  return (
    <Field name={name} label={label} errors={errors} className={className}>
      <textarea
        name={name}
        rows={3}
        aria-invalid={Boolean(errors?.[name])}
        aria-describedby={describedBy(name, errors)}
        className={inputClass}
        {...area}
      />
    </Field>
  );
}

/** A group of checkboxes or radios sharing one name, with a legend. */
export function ChoiceGroup({
  name,
  legend,
  type,
  options,
  checked,
  errors,
  onChange,
}: {
  name: string;
  legend: string;
  type: "checkbox" | "radio";
  options: ReadonlyArray<{ value: string; label: string }>;
  checked: readonly string[];
  errors?: FieldErrors;
  onChange?: (value: string) => void;
}) {
  return (
    <fieldset aria-describedby={errors?.[name] ? `${name}-error` : undefined}>
      <legend className="text-sm font-medium">{legend}</legend>
      <div className="mt-1 flex flex-wrap gap-2">
        {options.map((o) => (
          <label
            key={o.value}
            className="flex min-h-11 cursor-pointer items-center gap-2 rounded-lg border border-line bg-white px-3 py-2 has-checked:border-verdigris-700 has-checked:bg-verdigris-50"
          >
            <input
              type={type}
              name={name}
              value={o.value}
              defaultChecked={checked.includes(o.value)}
              onChange={onChange ? () => onChange(o.value) : undefined}
              className="size-5 accent-verdigris-700"
            />
            <span>{o.label}</span>
          </label>
        ))}
      </div>
      <ErrorText name={name} errors={errors} />
    </fieldset>
  );
}

export function FormProblem({ message }: { message: string | null | undefined }) {
  return message ? (
    <p role="alert" className="rounded-lg bg-orange-50 px-3 py-2 text-sm text-alert">
      {message}
    </p>
  ) : null;
}

export function SubmitButton({ busy, children, busyText }: { busy: boolean; children: ReactNode; busyText: string }) {
  return (
    <button
      type="submit"
      disabled={busy}
      className="rounded-lg bg-verdigris-700 px-5 py-3 font-semibold text-white hover:bg-verdigris-900 disabled:opacity-60"
    >
      {busy ? busyText : children}
    </button>
  );
}

export function options<T extends Record<string, string>>(labels: T) {
  return Object.entries(labels).map(([value, label]) => ({ value, label }));
}
