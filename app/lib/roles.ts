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
  /** Pool pages and the pool list; technicians are further limited to their routes' pools. */
  pools: ["owner", "manager", "technician", "analyst"],
  /** Logging a visit: tests, observations, treatments. */
  visit: ["owner", "manager", "technician"],
  /** Reading routes, fill sources, products. */
  routebook: ["owner", "manager", "technician", "analyst"],
  /** Creating and changing routes, pools, fill sources, equipment, products. */
  routebookEdit: ["owner", "manager"],
  overview: ["owner", "manager"],
  recurring: ["owner", "manager", "analyst"],
  risk: ["owner", "manager", "analyst"],
  sources: ["owner", "manager", "technician", "analyst"],
  outcomes: ["owner", "manager"],
  /** The four-week metal outlook; technicians see their routes' pools. */
  outlook: ["owner", "manager", "technician", "analyst"],
  imports: ["owner", "analyst"],
  exports: ["owner", "manager", "analyst"],
  team: ["owner"],
  settings: ["owner"],
  /** The development mail viewer. */
  mailbox: ["owner"],
} as const satisfies Record<string, readonly RoleName[]>;

export type Area = keyof typeof AREA_ROLES;

export function roleMayOpen(role: RoleName, area: Area): boolean {
  return (AREA_ROLES[area] as readonly RoleName[]).includes(role);
}
