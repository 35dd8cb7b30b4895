import { createStore, del, get, set, type UseStore, values } from "idb-keyval";
import { useEffect, useState } from "react";
import { z } from "zod";

/**
 * Visits kept on the phone (IndexedDB, through idb-keyval) until the server
 * has them. Every visit saved with the page's script is kept here first and
 * forgotten only when the server has stored it (its submission key makes a
 * second send store nothing) or when the form shows the server's refusal.
 */

const answerSchema = z.object({
  fieldErrors: z.record(z.string(), z.string()),
  formError: z.string().nullable(),
});

const keptVisitSchema = z.object({
  key: z.string().min(8).max(64),
  poolId: z.number().int().positive(),
  poolLabel: z.string().max(300),
  memberId: z.string().max(200),
  /** The form's fields as typed, in order (treatment lines repeat their names). */
  fields: z.array(z.tuple([z.string(), z.string()])).max(300),
  keptAt: z.iso.datetime(),
  /** waiting: to be sent; refused: the server said why, the technician fixes it on the form. */
  state: z.enum(["waiting", "refused"]),
  answer: answerSchema.nullable(),
});

export type KeptVisit = z.infer<typeof keptVisitSchema>;
export type KeptAnswer = z.infer<typeof answerSchema>;

/** Form fields the page adds for the phone's own use; the server ignores them. */
export const KEPT_FIELDS = { poolLabel: "keptPoolLabel", memberId: "keptBy", takenAt: "takenAt", resend: "keptResend" } as const;

let store: UseStore | undefined;
/** Opened on first use: the server renders the pages that import this module and has no IndexedDB. */
function keptStore(): UseStore {
  store ??= createStore("patina-kept-visits", "visits");
  return store;
}

const listeners = new Set<() => void>();
function changed() {
  for (const listener of listeners) listener();
}

/** The visit a submitted form describes, as it would be kept; null when the form has no submission key. */
export function keptVisitFrom(form: FormData, poolId: number, now: Date): KeptVisit | null {
  const fields: Array<[string, string]> = [];
  for (const [name, value] of form.entries()) {
    if (typeof value === "string" && name !== KEPT_FIELDS.resend) fields.push([name, value]);
  }
  const named = (name: string) => fields.find(([n]) => n === name)?.[1] ?? "";
  if (!fields.some(([n]) => n === KEPT_FIELDS.takenAt)) fields.push([KEPT_FIELDS.takenAt, now.toISOString()]);
  const parsed = keptVisitSchema.safeParse({
    key: named("submissionKey"),
    poolId,
    poolLabel: named(KEPT_FIELDS.poolLabel).slice(0, 300) || `Pool ${poolId}`,
    memberId: named(KEPT_FIELDS.memberId),
    fields,
    keptAt: now.toISOString(),
    state: "waiting",
    answer: null,
  });
  return parsed.success ? parsed.data : null;
}

/** The kept visit as a form to post again, marked as a resend so the page does not move on. */
export function resendForm(visit: KeptVisit): FormData {
  const form = new FormData();
  for (const [name, value] of visit.fields) form.append(name, value);
  form.set(KEPT_FIELDS.resend, "1");
  return form;
}

/** The kept fields as the visit form reads typed values (treatment columns as lists). */
export function typedValuesOf(visit: KeptVisit, repeated: readonly string[]): Record<string, string | string[]> {
  const typed: Record<string, string | string[]> = {};
  for (const name of repeated) typed[name] = [];
  for (const [name, value] of visit.fields) {
    const column = typed[name];
    if (repeated.includes(name) && Array.isArray(column)) column.push(value);
    else typed[name] = value;
  }
  return typed;
}

export async function keepVisit(visit: KeptVisit): Promise<void> {
  await set(visit.key, visit, keptStore());
  changed();
}

export async function forgetVisit(key: string): Promise<void> {
  await del(key, keptStore());
  changed();
}

export async function keptVisit(key: string): Promise<KeptVisit | null> {
  const parsed = keptVisitSchema.safeParse(await get(key, keptStore()));
  return parsed.success ? parsed.data : null;
}

/** Every kept visit, oldest first. A record this version cannot read is left in place, never deleted. */
export async function keptVisits(): Promise<KeptVisit[]> {
  const all = await values(keptStore());
  return all
    .map((v) => keptVisitSchema.safeParse(v))
    .flatMap((p) => (p.success ? [p.data] : []))
    .sort((a, b) => a.keptAt.localeCompare(b.keptAt));
}

/** The kept visits, read again whenever one is kept, sent or refused; null until first read. */
export function useKeptVisits(): KeptVisit[] | null {
  const [visits, setVisits] = useState<KeptVisit[] | null>(null);
  useEffect(() => {
    let current = true;
    const read = () => {
      keptVisits().then(
        (all) => current && setVisits(all),
        () => current && setVisits([]),
      );
    };
    read();
    listeners.add(read);
    return () => {
      current = false;
      listeners.delete(read);
    };
  }, []);
  return visits;
}

/** A refused visit's answer, from what the server's checks returned. */
export function answerOf(refusal: unknown): KeptAnswer {
  const parsed = answerSchema.safeParse(refusal);
  return parsed.success ? parsed.data : { fieldErrors: {}, formError: "The server refused this visit; check the entries and save again." };
}
