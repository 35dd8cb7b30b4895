// Invented names for the demo company, its town, people and products.

export const COMPANY = {
  name: "Kettlewick Pool Care",
  town: "Larchmere Falls",
  timeZone: "America/New_York",
  accountPrefix: "KPC",
};

export const DEMO_EMAIL_DOMAIN = "patina.example";

export const NEIGHBOURHOODS = {
  oldMill: { name: "Old Mill", postalCode: "LF 101" },
  lakeside: { name: "Lakeside Terrace", postalCode: "LF 102" },
  birchHollow: { name: "Birch Hollow", postalCode: "LF 103" },
  sawyersBend: { name: "Sawyers Bend", postalCode: "LF 104" },
  quarryHeights: { name: "Quarry Heights", postalCode: "LF 105" },
} as const;
export type NeighbourhoodKey = keyof typeof NEIGHBOURHOODS;

export const STREETS: Record<NeighbourhoodKey, readonly string[]> = {
  oldMill: ["Millrace Lane", "Weir Street", "Grindstone Court", "Flume Road", "Tanner Row"],
  lakeside: ["Shoreline Drive", "Heron Walk", "Boathouse Lane", "Reedbank Close", "Pier View"],
  birchHollow: ["Birchwood Avenue", "Fernside Road", "Hollow Way", "Copse Lane", "Thicket Court"],
  sawyersBend: ["Sawmill Road", "Oxbow Lane", "Ferry Track", "Willow Bend", "Lantern Road"],
  quarryHeights: ["Quarry Road", "Flint Ridge", "Slate Terrace", "Cobble Hill", "Granite Way"],
};

export const FIRST_NAMES = [
  "Alder", "Briony", "Caspian", "Delphine", "Emrys", "Fenella", "Gideon", "Hollis", "Isolde", "Jory",
  "Kestrel", "Linnea", "Marlow", "Niamh", "Orrin", "Perpetua", "Quill", "Rosalind", "Silas", "Tamsin",
  "Ulric", "Verity", "Wystan", "Xanthe", "Yorick", "Zinnia", "Anselm", "Bryony", "Cosmo", "Dagny",
] as const;

export const LAST_NAMES = [
  "Ashcombe", "Brackwater", "Cullingford", "Dunmore", "Eskdale", "Farrowby", "Gillingham", "Hartwell",
  "Inchcape", "Jessop", "Kilbride", "Lockridge", "Marchbank", "Netherby", "Oakhurst", "Pennock",
  "Quarrington", "Rushworth", "Stowell", "Thistlewood", "Underhill", "Vellacott", "Wetherall", "Yarwood",
] as const;

export const ROUTES = [
  { key: "north", name: "North loop", serviceWeekdays: "1,4" },
  { key: "river", name: "River route", serviceWeekdays: "2,5" },
  { key: "hills", name: "Quarry hills", serviceWeekdays: "3,6" },
] as const;
export type RouteKey = (typeof ROUTES)[number]["key"];

export const DEMO_USERS = [
  { key: "owner", name: "Ilse Varnham", email: "owner", password: "owner-demo-2026", role: "owner" },
  { key: "manager", name: "Tobin Quayle", email: "manager", password: "manager-demo-2026", role: "manager" },
  { key: "tech1", name: "Nico Brannagh", email: "tech", password: "tech-demo-2026", role: "technician" },
  { key: "tech2", name: "Sade Whitlow", email: "tech2", password: "tech2-demo-2026", role: "technician" },
  { key: "analyst", name: "Priya Halloran", email: "analyst", password: "analyst-demo-2026", role: "analyst" },
] as const;
export type DemoUserKey = (typeof DEMO_USERS)[number]["key"];

/** Which technician works which route: the first technician covers two routes. */
export const ROUTE_TECHNICIAN: Record<RouteKey, DemoUserKey> = {
  north: "tech1",
  river: "tech1",
  hills: "tech2",
};
