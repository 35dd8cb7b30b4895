import { data } from "react-router";
import type { FieldErrors } from "~/lib/forms/fields";

export type ServiceRefusal = {
  ok: false;
  status: 400 | 404 | 409;
  fieldErrors: FieldErrors;
  formError: string | null;
};

export type ServiceResult<T extends object = { id: number }> = ({ ok: true } & T) | ServiceRefusal;

export function invalid(fieldErrors: FieldErrors, formError: string | null = null): ServiceRefusal {
  return { ok: false, status: 400, fieldErrors, formError };
}

export function notFound(message: string): ServiceRefusal {
  return { ok: false, status: 404, fieldErrors: {}, formError: message };
}

export function conflict(field: string, message: string): ServiceRefusal {
  return { ok: false, status: 409, fieldErrors: { [field]: message }, formError: null };
}

/**
 * MariaDB's duplicate-key error, optionally for one named unique key. Drizzle
 * wraps driver errors, so the cause chain is searched.
 */
export function isDuplicateKey(error: unknown, keyName?: string): boolean {
  for (let e: unknown = error; e; e = (e as { cause?: unknown }).cause) {
    const candidate = e as { code?: string; message?: string };
    if (candidate.code === "ER_DUP_ENTRY") return keyName ? Boolean(candidate.message?.includes(keyName)) : true;
  }
  return false;
}

/** A unique key of the company's rows, with the form field and message that answer a clash on it. */
export type UniqueKeyClash = { key: string; field: string; message: string };

/** A clash on the given unique key becomes a 409 on its field; any other error is thrown on. */
export function refuseClash(error: unknown, clash: UniqueKeyClash): ServiceRefusal {
  if (isDuplicateKey(error, clash.key)) return conflict(clash.field, clash.message);
  throw error;
}

/** A refusal as a form action's answer: field errors for the form, with the service's status. */
export function refusedAnswer(refused: Pick<ServiceRefusal, "fieldErrors" | "formError"> & { status?: number }) {
  return data(
    { ok: false as const, fieldErrors: refused.fieldErrors, formError: refused.formError },
    { status: refused.status ?? 400 },
  );
}
