import { z } from "zod";

export const createApiTokenSchema = z.object({
  name: z
    .string({ error: "Name the token (e.g. 'upload script')." })
    .trim()
    .min(1, "Name the token (e.g. 'upload script').")
    .max(100, "Use at most 100 characters."),
});
export type CreateApiTokenInput = z.infer<typeof createApiTokenSchema>;

export const apiTokenIdSchema = z.coerce.number({ error: "A token id is a positive whole number." }).int().positive("A token id is a positive whole number.");
