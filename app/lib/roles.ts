export const ROLE_NAMES = ["owner", "manager", "technician", "analyst"] as const;
export type RoleName = (typeof ROLE_NAMES)[number];

export const ROLE_LABELS: Record<RoleName, string> = {
  owner: "Owner",
  manager: "Manager",
  technician: "Technician",
  analyst: "Analyst",
};

/** Who may open each area of the app; the guard and the navigation both read this. */
export const AREA_ROLES = {
  home: ["owner", "manager", "technician", "analyst"],
  pools: ["owner", "manager", "technician", "analyst"],
  team: ["owner"],
  settings: ["owner"],
} as const satisfies Record<string, readonly RoleName[]>;

export type Area = keyof typeof AREA_ROLES;

export function roleMayOpen(role: RoleName, area: Area): boolean {
  return (AREA_ROLES[area] as readonly RoleName[]).includes(role);
}
