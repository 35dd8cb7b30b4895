import { z } from "zod";

export const poolIdParams = z.object({
  poolId: z.coerce
    .number({ error: "poolId must be a number" })
    .int({ error: "poolId must be a whole number" })
    .positive({ error: "poolId must be positive" }),
});
