import { z } from "zod";

export const uploadIdParams = z.object({
  uploadId: z.uuid({ error: "uploadId is not an upload id" }),
});
