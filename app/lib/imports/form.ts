import { z } from "zod";
import { importOptionsSchema, type ImportOptions } from "./options";

/**
 * The check page's form: column-<i> and unit-<i> for each column, dateOrder,
 * createPool and createProduct (repeated), and the intent.
 */
export const checkIntents = ["check", "commit", "save-mapping", "discard"] as const;

const intentSchema = z.enum(checkIntents, { error: (issue) => `intent "${String(issue.input)}" is not one of ${checkIntents.join(", ")}` });

export type CheckForm =
  | { ok: true; intent: (typeof checkIntents)[number]; options: ImportOptions; mappingName: string | null }
  | { ok: false; field: string; message: string };

export function readCheckForm(form: FormData, columnCount: number): CheckForm {
  const intent = intentSchema.safeParse(form.get("intent"));
  if (!intent.success) return { ok: false, field: "intent", message: intent.error.issues[0]!.message };
  // One pass over the form: FormData.get scans every entry, so a get per column would be quadratic.
  const values = new Map<string, FormDataEntryValue>();
  for (const [name, value] of form.entries()) if (!values.has(name)) values.set(name, value);
  const columns = Array.from({ length: columnCount }, (_, i) => {
    const unit = values.get(`unit-${i}`);
    return { field: values.get(`column-${i}`) ?? "ignore", ...(unit ? { unit } : {}) };
  });
  const dateOrder = form.get("dateOrder");
  const parsed = importOptionsSchema.safeParse({
    columns,
    dateOrder: dateOrder === "dmy" || dateOrder === "mdy" ? dateOrder : null,
    createPools: form.getAll("createPool").map(String),
    createProducts: form.getAll("createProduct").map(String),
  });
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    const path = issue.path;
    const field = path[0] === "columns" ? `column-${String(path[1])}` : path.join(".");
    return { ok: false, field, message: `${field}: ${issue.message}` };
  }
  const options = parsed.data as ImportOptions;
  const fieldsUsed = options.columns.map((c) => c.field).filter((f) => f !== "ignore");
  const seen = new Set<string>();
  const twice = fieldsUsed.find((f) => (seen.has(f) ? true : (seen.add(f), false)));
  if (twice) return { ok: false, field: "columns", message: `Two columns are read as "${twice}"; choose one and leave the other out.` };
  const name = String(form.get("mappingName") ?? "").trim();
  if (intent.data === "save-mapping" && (name.length === 0 || name.length > 120)) {
    return { ok: false, field: "mappingName", message: "mappingName: give the saved mapping a name of 1 to 120 characters." };
  }
  return { ok: true, intent: intent.data, options, mappingName: name || null };
}
