import { z } from "zod";

export const PASSWORD_MIN_LENGTH = 12;
export const PASSWORD_MAX_LENGTH = 128;

/** A new password typed twice (invitation and reset forms). */
export const newPasswordFields = {
  password: z
    .string()
    .min(PASSWORD_MIN_LENGTH, { error: `Use at least ${PASSWORD_MIN_LENGTH} characters.` })
    .max(PASSWORD_MAX_LENGTH, { error: `Use at most ${PASSWORD_MAX_LENGTH} characters.` }),
  confirm: z.string(),
};

export function passwordsMatch(value: { password: string; confirm: string }) {
  return value.password === value.confirm;
}
export const passwordMismatch = { error: "The two passwords differ; type the same one twice.", path: ["confirm"] };

/** The first message per field, for forms that show errors beside their fields. */
export function fieldErrorsOf(issues: ReadonlyArray<{ path: ReadonlyArray<PropertyKey>; message: string }>) {
  const errors: Record<string, string> = {};
  for (const issue of issues) errors[String(issue.path[0] ?? "form")] ??= issue.message;
  return errors;
}
