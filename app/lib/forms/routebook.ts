import { z } from "zod";
import { plainId } from "../strict-params";
import { poolVolume, isVolumeError, type PoolShape } from "@analysis/units/volume";
import type { MetalReading } from "@analysis/metals/reading";
import { parseMetalReading } from "@analysis/metals/parse-reading";
import { type UnitSystem, volumeToLitres } from "~/lib/units";
import {
  checkbox,
  type FieldErrors,
  fieldErrorsOf,
  optionalChoice,
  optionalDate,
  optionalEmail,
  optionalId,
  optionalNumber,
  optionalText,
  requiredChoice,
  requiredDate,
  requiredText,
} from "./fields";
import { DOSE_BASES, EQUIPMENT_KINDS, EXCHANGER_METALS, PRODUCT_CATEGORIES, SANITISERS, SOURCE_KINDS, SURFACES } from "../stored-values";

export {
  DOSE_BASES,
  EQUIPMENT_KINDS,
  EXCHANGER_METALS,
  PRODUCT_CATEGORIES,
  SANITISERS,
  SOURCE_KINDS,
  SURFACES,
} from "../stored-values";
export const POOL_SHAPES = ["rectangle", "round", "oval", "kidney"] as const;

export type Parsed<T> = { ok: true; value: T } | { ok: false; fieldErrors: FieldErrors };

function parseWith<S extends z.ZodType>(schema: S, input: unknown): Parsed<z.output<S>> {
  const parsed = schema.safeParse(input);
  return parsed.success ? { ok: true, value: parsed.data } : { ok: false, fieldErrors: fieldErrorsOf(parsed.error) };
}

// ---------------------------------------------------------------------------
// Routes

export const routeForm = z.object({
  name: requiredText("Route name", 120),
  serviceWeekdays: z
    .array(z.string())
    .transform((days, ctx) => {
      const numbers = [...new Set(days)].map(Number);
      const wrong = numbers.find((d) => !Number.isInteger(d) || d < 1 || d > 7);
      if (wrong !== undefined) {
        ctx.addIssue({ code: "custom", message: `Service days: "${wrong}" is not a weekday (1 = Monday … 7 = Sunday).` });
        return z.NEVER;
      }
      if (numbers.length === 0) {
        ctx.addIssue({ code: "custom", message: "Service days: choose at least one weekday." });
        return z.NEVER;
      }
      return numbers.sort((a, b) => a - b).join(",");
    }),
  technicianIds: z.array(z.string().max(36)).transform((ids) => [...new Set(ids.filter(Boolean))]),
  /** Unticked: archived (kept with its history, gone from the day's list and the pickers). */
  active: checkbox,
});
export type RouteInput = z.output<typeof routeForm>;
export const parseRouteForm = (input: unknown) => parseWith(routeForm, input);

// ---------------------------------------------------------------------------
// Fill sources and their tests

export const sourceForm = z.object({
  name: requiredText("Source name", 160),
  kind: requiredChoice("Kind", SOURCE_KINDS),
  notes: optionalText("Notes", 2000),
  /** Unticked: archived (kept with its tests and pools, gone from the pickers). */
  active: checkbox,
});
export type SourceInput = z.output<typeof sourceForm>;
export const parseSourceForm = (input: unknown) => parseWith(sourceForm, input);

const METAL_FIELD_LABELS = { copper: "Copper", iron: "Iron", manganese: "Manganese" } as const;

/** A metal result typed as "0.3", "<0.05" or left empty. */
export function metalField(metal: keyof typeof METAL_FIELD_LABELS) {
  return z
    .string()
    .optional()
    .transform((v, ctx): MetalReading | null => {
      const parsed = parseMetalReading(v ?? "", METAL_FIELD_LABELS[metal]);
      if (!parsed.ok) {
        ctx.addIssue({ code: "custom", message: `${parsed.message} (mg/L, 0 to 10).` });
        return z.NEVER;
      }
      return parsed.reading;
    });
}

export const sourceTestForm = z
  .object({
    sampledOn: requiredDate("Sampled on"),
    copper: metalField("copper"),
    iron: metalField("iron"),
    manganese: metalField("manganese"),
    note: optionalText("Note", 2000),
  })
  .superRefine((v, ctx) => {
    if (!v.copper && !v.iron && !v.manganese) {
      ctx.addIssue({ code: "custom", path: ["copper"], message: "Copper: enter at least one metal result." });
    }
  });
export type SourceTestInput = z.output<typeof sourceTestForm>;
export const parseSourceTestForm = (input: unknown) => parseWith(sourceTestForm, input);

// ---------------------------------------------------------------------------
// Products

export const productForm = z
  .object({
    name: requiredText("Product name", 160),
    category: requiredChoice("Category", PRODUCT_CATEGORIES),
    labelDose: optionalNumber({ label: "Label dose", min: 0.001, max: 100_000 }),
    // Optional in the post too: a client that predates it leaves the stored value as it is.
    maintenanceDose: optionalNumber({ label: "Maintenance dose", min: 0.001, max: 100_000 }).optional(),
    doseUnit: optionalText("Dose unit", 16),
    doseBasis: requiredChoice("Dose basis", DOSE_BASES),
    unitCost: optionalNumber({ label: "Unit cost", min: 0, max: 100_000 }),
    active: checkbox,
  })
  .superRefine((v, ctx) => {
    if ((v.labelDose !== null || v.maintenanceDose != null || v.unitCost !== null) && !v.doseUnit) {
      ctx.addIssue({ code: "custom", path: ["doseUnit"], message: "Dose unit: name the unit the label dose and cost are given in (e.g. fl oz, lb, pad)." });
    }
  });
export type ProductInput = z.output<typeof productForm>;
export const parseProductForm = (input: unknown) => parseWith(productForm, input);

// ---------------------------------------------------------------------------
// Equipment

export const equipmentForm = z
  .object({
    kind: requiredChoice("Kind", EQUIPMENT_KINDS),
    exchangerMetal: optionalChoice("Heat-exchanger metal", EXCHANGER_METALS),
    description: optionalText("Description", 200),
    installedOn: optionalDate("Installed on"),
  });
export type EquipmentInput = z.output<typeof equipmentForm>;
export const parseEquipmentForm = (input: unknown) => parseWith(equipmentForm, input);

export const removalForm = z.object({
  equipmentId: plainId("Equipment"),
  removedOn: requiredDate("Removed on"),
});
export const parseRemovalForm = (input: unknown) => parseWith(removalForm, input);

// ---------------------------------------------------------------------------
// Pools

const LENGTH_BOUNDS = { ft: 300, m: 100 } as const;

/** Accepted directly entered volumes, in the company's unit. */
export const VOLUME_BOUNDS: Record<UnitSystem, { min: number; max: number; unit: string }> = {
  us: { min: 100, max: 2_000_000, unit: "gal" },
  metric: { min: 400, max: 7_500_000, unit: "L" },
};

const poolFields = z.object({
  accountCode: requiredText("Account code", 40),
  customerName: requiredText("Customer name", 200),
  customerPhone: optionalText("Customer phone", 40),
  customerEmail: optionalEmail("Customer e-mail"),
  street: requiredText("Street address", 255),
  neighbourhood: optionalText("Neighbourhood", 120),
  postalCode: optionalText("Postal code", 20),
  routeId: optionalId("Route"),
  fillSourceId: optionalId("Fill source"),
  surface: optionalChoice("Surface", SURFACES),
  sanitiser: optionalChoice("Sanitiser", SANITISERS),
  active: checkbox,
  volumeMode: z.enum(["direct", "shape"]).catch("direct"),
});

export type PoolInput = Omit<z.output<typeof poolFields>, "volumeMode"> & { volumeLitres: number | null };

function dimension(raw: Record<string, unknown>, field: string, label: string, unit: "ft" | "m", errors: FieldErrors) {
  const parsed = optionalNumber({ label, min: 0.1, max: LENGTH_BOUNDS[unit], unit }).safeParse(raw[field]);
  if (!parsed.success) {
    errors[field] = parsed.error.issues[0]?.message ?? `${label}: not valid.`;
    return 0;
  }
  if (parsed.data === null) {
    errors[field] = `${label}: enter the measurement in ${unit}.`;
    return 0;
  }
  return parsed.data;
}

/** Volume from the outline and depths, or null with errors set per field. */
export function shapeFromForm(raw: Record<string, unknown>, errors: FieldErrors): PoolShape | null {
  const shapeParse = requiredChoice("Shape", POOL_SHAPES).safeParse(raw.shape);
  const unit = raw.lengthUnit === "m" ? "m" : "ft";
  if (!shapeParse.success) {
    errors.shape = shapeParse.error.issues[0]?.message ?? "Shape: choose one.";
    return null;
  }
  const before = Object.keys(errors).length;
  const depth = {
    shallow: dimension(raw, "shallowDepth", "Shallow-end depth", unit, errors),
    deep: dimension(raw, "deepDepth", "Deep-end depth", unit, errors),
  };
  let shape: PoolShape;
  switch (shapeParse.data) {
    case "rectangle":
    case "oval":
      shape = {
        shape: shapeParse.data,
        length: dimension(raw, "length", "Length", unit, errors),
        width: dimension(raw, "width", "Width", unit, errors),
        depth,
        unit,
      };
      break;
    case "round":
      shape = { shape: "round", diameter: dimension(raw, "diameter", "Diameter", unit, errors), depth, unit };
      break;
    case "kidney":
      shape = {
        shape: "kidney",
        length: dimension(raw, "length", "Length", unit, errors),
        widthA: dimension(raw, "widthA", "Width at the wide end", unit, errors),
        widthB: dimension(raw, "widthB", "Width at the narrow end", unit, errors),
        depth,
        unit,
      };
      break;
  }
  return Object.keys(errors).length > before ? null : shape;
}

export function parsePoolForm(raw: Record<string, unknown>, units: UnitSystem): Parsed<PoolInput> {
  const parsed = poolFields.safeParse(raw);
  const errors: FieldErrors = parsed.success ? {} : fieldErrorsOf(parsed.error);
  let volumeLitres: number | null = null;
  const mode = parsed.success ? parsed.data.volumeMode : raw.volumeMode === "shape" ? "shape" : "direct";
  if (mode === "shape") {
    const shape = shapeFromForm(raw, errors);
    if (shape) {
      const volume = poolVolume(shape);
      if (isVolumeError(volume)) errors[volume.field] = `${volume.field}: must be above zero.`;
      else volumeLitres = Math.round(volume.litres);
    }
  } else {
    const bounds = VOLUME_BOUNDS[units];
    const volume = optionalNumber({ label: "Volume", min: bounds.min, max: bounds.max, unit: bounds.unit }).safeParse(raw.volume);
    if (!volume.success) errors.volume = volume.error.issues[0]?.message ?? "Volume: not valid.";
    else if (volume.data !== null) volumeLitres = volumeToLitres(volume.data, units);
  }
  if (!parsed.success || Object.keys(errors).length > 0) return { ok: false, fieldErrors: errors };
  const { volumeMode: _mode, ...fields } = parsed.data;
  return { ok: true, value: { ...fields, volumeLitres } };
}
