import { z } from "zod";
import { plainId } from "./strict-params";

export const poolIdParams = z.object({ poolId: plainId("poolId") });
