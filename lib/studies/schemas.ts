/** One validation schema per study form, shared by the forms, the server actions and the services. */
import { z } from "zod";

export const SLUG_PATTERN = /^[a-z0-9](?:[a-z0-9-]{0,98}[a-z0-9])?$/;

const slug = z
  .string()
  .trim()
  .toLowerCase()
  .min(2, "Give the study a short address of at least 2 characters, e.g. barley-nitrogen.")
  .max(100, "Keep the address to 100 characters or fewer.")
  .regex(
    SLUG_PATTERN,
    "Use lower-case letters, digits and dashes only, starting and ending with a letter or digit.",
  )
  .refine(
    (s) => !/^\d+$/.test(s),
    "An address made only of digits would be mistaken for a study number; add a letter.",
  )
  .refine((s) => s !== "new", '"new" is reserved for the page that creates a study; choose another address.');

const title = z
  .string()
  .trim()
  .min(3, "Give the study a title of at least 3 characters.")
  .max(300, "Keep the title to 300 characters or fewer.");

const description = z
  .string()
  .trim()
  .max(5000, "Keep the description to 5,000 characters or fewer.")
  .optional()
  .transform((s) => (s ? s : null));

/** Form fields arrive as strings: an empty select means "none". */
const optionalId = z.preprocess(
  (v) => (v === "" || v === null || v === undefined ? null : v),
  z.coerce
    .number()
    .int("Choose an organisation from the list.")
    .positive("Choose an organisation from the list.")
    .nullable(),
);

export const createStudySchema = z.object({
  slug,
  title,
  description,
  teamOrganisationId: optionalId,
});
export type CreateStudyInput = z.input<typeof createStudySchema>;

export const updateStudySchema = z
  .object({
    title: title.optional(),
    description: z
      .string()
      .trim()
      .max(5000, "Keep the description to 5,000 characters or fewer.")
      .nullable()
      .optional()
      .transform((s) => (s === undefined ? undefined : s ? s : null)),
    status: z.enum(["open", "closed"], { message: "The status is open or closed." }).optional(),
  })
  .refine((v) => v.title !== undefined || v.description !== undefined || v.status !== undefined, {
    message: "Nothing to change: send a title, a description or a status.",
    path: ["_form"],
  });
export type UpdateStudyInput = z.input<typeof updateStudySchema>;

export const planNoteSchema = z
  .string()
  .trim()
  .max(500, "Keep the note to 500 characters or fewer.")
  .optional()
  .nullable()
  .transform((s) => (s ? s : null));

export const memberIdSchema = z.coerce
  .number({ message: "Choose someone from the list." })
  .int()
  .positive("Choose someone from the list.");
