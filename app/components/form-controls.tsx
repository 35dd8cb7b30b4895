import type { ReactNode } from "react";
import { useNavigation } from "react-router";
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

/** A field's own props apart from those of its control. */
function splitField<Rest>({ name, label, errors, hint, className, ...control }: Common & Rest): [Common, Omit<Rest, keyof Common>] {
  return [{ name, label, errors, hint, className }, control];
}

/** What every control of a field carries: its name, its invalid state and the ids of its error and hint. */
function controlProps({ name, errors, hint }: Common) {
  const ids = [errors?.[name] ? `${name}-error` : null, hint ? `${name}-hint` : null].filter(Boolean);
  return {
    name,
    "aria-invalid": Boolean(errors?.[name]),
    "aria-describedby": ids.length > 0 ? ids.join(" ") : undefined,
    className: inputClass,
  };
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

export function TextField(props: Common & Omit<React.InputHTMLAttributes<HTMLInputElement>, "name">) {
  const [field, input] = splitField(props);
  return (
    <Field {...field}>
      <input {...controlProps(field)} {...input} />
    </Field>
  );
}

export function SelectField({
  options,
  placeholder,
  ...props
}: Common & {
  options: ReadonlyArray<{ value: string; label: string }>;
  placeholder?: string;
} & Omit<React.SelectHTMLAttributes<HTMLSelectElement>, "name">) {
  const [field, select] = splitField(props);
  return (
    <Field {...field}>
      <select {...controlProps(field)} {...select}>
        <OptionList options={options} blank={placeholder} />
      </select>
    </Field>
  );
}

export function TextAreaField(props: Common & Omit<React.TextareaHTMLAttributes<HTMLTextAreaElement>, "name">) {
  const [field, area] = splitField(props);
  return (
    <Field {...field}>
      <textarea rows={3} {...controlProps(field)} {...area} />
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

/** A form's submit button, disabled and saying `busyText` while the form is being sent. */
export function SubmitButton({
  busy,
  children,
  busyText,
  className = "rounded-lg bg-verdigris-700 px-5 py-3 font-semibold text-white hover:bg-verdigris-900 disabled:opacity-60",
}: {
  busy: boolean;
  children: ReactNode;
  busyText: string;
  className?: string;
}) {
  return (
    <button type="submit" disabled={busy} className={className}>
      {busy ? busyText : children}
    </button>
  );
}

/** The end of a form that saves: the form's problem, if any, then the save button, busy while the post runs. */
export function SaveFooter({ formError, children }: { formError: string | null | undefined; children: ReactNode }) {
  const busy = useNavigation().state === "submitting";
  return (
    <>
      <FormProblem message={formError} />
      <SubmitButton busy={busy} busyText="Saving…">
        {children}
      </SubmitButton>
    </>
  );
}

/** The options of a select, after a first empty-valued one (`blank`: "All …", "Choose…") when given. */
export function OptionList({ options, blank }: { options: ReadonlyArray<{ value: string; label: string }>; blank?: string }) {
  return (
    <>
      {blank !== undefined ? <option value="">{blank}</option> : null}
      {options.map((o) => (
        <option key={o.value} value={o.value}>
          {o.label}
        </option>
      ))}
    </>
  );
}

export function options<T extends Record<string, string>>(labels: T) {
  return Object.entries(labels).map(([value, label]) => ({ value, label }));
}
