import { z } from "zod";
import { COLUMN_UNITS, type ColumnMapping, IMPORT_FIELDS } from "./fields";

const targets = ["ignore", ...IMPORT_FIELDS] as [string, ...string[]];

export const columnMappingSchema = z.object({
  field: z.enum(targets, { error: (issue) => `"${String(issue.input)}" is not a field Patina can import` }),
  unit: z.enum(Object.keys(COLUMN_UNITS) as [string, ...string[]]).optional(),
});

/** Everything the person chooses on the check page; stored with the upload. */
export const importOptionsSchema = z.object({
  columns: z.array(columnMappingSchema),
  dateOrder: z.enum(["dmy", "mdy"]).nullable().default(null),
  /** Unknown pools (by their listing key) to create from the file's columns; the rest are left out. */
  createPools: z.array(z.string()).default([]),
  /** Unknown product names (by key) to add to the product list; other treatments are left out. */
  createProducts: z.array(z.string()).default([]),
});

export type ImportOptions = Omit<z.infer<typeof importOptionsSchema>, "columns"> & { columns: ColumnMapping[] };

export function readImportOptions(value: unknown): ImportOptions | null {
  const parsed = importOptionsSchema.safeParse(value);
  return parsed.success ? (parsed.data as ImportOptions) : null;
}
