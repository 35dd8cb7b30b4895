/** A route or fill source as pickers and filters list it. */
export type ArchivableOption = { id: number; name: string; active: boolean };

export const ARCHIVE_STATUSES = ["active", "archived", "all"] as const;
export type ArchiveStatus = (typeof ARCHIVE_STATUSES)[number];

export const ARCHIVE_STATUS_OPTIONS = [
  { value: "active", label: "In use" },
  { value: "archived", label: "Archived" },
  { value: "all", label: "All" },
] as const;

/** The `active` condition a list filter asks for; null means both. */
export function activeWanted(status: ArchiveStatus): boolean | null {
  return status === "all" ? null : status === "active";
}

export function optionLabel(option: ArchivableOption): string {
  return option.active ? option.name : `${option.name} (archived)`;
}

/**
 * Choices for a form's picker: archived entries are left out, except the one
 * already chosen, so editing a pool never silently drops its current route or
 * source.
 */
export function pickerOptions(all: readonly ArchivableOption[], current: number | null | undefined) {
  return all
    .filter((o) => o.active || o.id === current)
    .map((o) => ({ value: String(o.id), label: optionLabel(o) }));
}

/** Choices for a list filter: everything, archived entries marked. */
export function filterOptions(all: readonly ArchivableOption[]) {
  return all.map((o) => ({ value: String(o.id), label: optionLabel(o) }));
}
