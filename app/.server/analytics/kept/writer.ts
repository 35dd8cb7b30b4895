import type { MetalThresholds } from "@analysis/metals/reading";
import type { Database } from "../../db/client";

/** A connection inside a transaction: the drizzle transaction of a write, or a drizzle over the import's connection. */
export type Writer = Pick<Database, "execute">;

/** A kept version that writes keep in step, with the levels and zone it was built for. */
export type LiveVersion = { id: number; levels: MetalThresholds; timeZone: string };
