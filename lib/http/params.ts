/**
 * The route parameters of the v1 API, one schema each, shared by every route that takes them:
 * a batch's public id, a version number, a study's number or slug, a pool's study slug.
 * Bounds are checked here, so a route never sees an absurd value.
 */
import { z } from "zod";

/** A batch's public id as the API hands it out (base64url, at most 64 characters). */
export const batchIdParam = z
  .string()
  .min(1, "A batch is addressed by its id.")
  .max(64, "A batch id has at most 64 characters.");

/** A version number: 1, 2, … */
export const versionParam = z.coerce
  .number({ error: "version is a whole number from 1." })
  .int("version is a whole number from 1.")
  .positive("version is a whole number from 1.")
  .max(2_147_483_647, "version is a whole number from 1.");

export const batchParams = z.object({ id: batchIdParam });

export const batchVersionParams = z.object({ id: batchIdParam, version: versionParam });

/** A study by its number or its slug. */
export const studyParams = z.object({
  id: z
    .string()
    .regex(
      /^[a-z0-9][a-z0-9-]{0,99}$/i,
      "A study is addressed by its number or its slug (letters, digits, dashes).",
    ),
});

/** A pool, by its study's slug. */
export const poolParams = z.object({ slug: z.string().min(1).max(100) });

/** A numeric id in the path (a user, an API token), with the message for a bad one. */
export function idParams(message: string) {
  return z.object({ id: z.coerce.number({ error: message }).int(message).positive(message) });
}
