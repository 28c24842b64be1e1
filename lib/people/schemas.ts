/**
 * Validation for user administration and passwords, shared by forms (client), server
 * actions and route handlers. Form values arrive as strings: ids are coerced, "" is null.
 */
import { z } from "zod";
import { ROLES } from "@/db/schema";
import { PASSWORD_MIN_LENGTH } from "@/lib/auth/password-rules";

const emptyToNull = (v: unknown) => (v === "" || v === undefined ? null : v);
const toBoolean = (v: unknown) =>
  v === "true" || v === "on" || v === "1" ? true : v === "false" || v === "off" || v === "0" ? false : v;

export const roleSchema = z.enum(ROLES, { error: `Choose a role: ${ROLES.join(", ")}.` });

export const passwordSchema = z
  .string({ error: "Enter a password." })
  .min(PASSWORD_MIN_LENGTH, `Use at least ${PASSWORD_MIN_LENGTH} characters.`)
  .max(200, "Use at most 200 characters.");

export const createUserSchema = z.object({
  email: z
    .string({ error: "Enter an e-mail address." })
    .trim()
    .toLowerCase()
    .max(320, "Use at most 320 characters.")
    .pipe(z.email({ error: "Enter an e-mail address like name@example.org." })),
  name: z
    .string({ error: "Enter a name." })
    .trim()
    .min(1, "Enter a name.")
    .max(200, "Use at most 200 characters."),
  role: roleSchema,
  organisationId: z.preprocess(
    emptyToNull,
    z.coerce
      .number({ error: "Choose an organisation." })
      .int("Choose an organisation.")
      .positive("Choose an organisation.")
      .nullable(),
  ),
  /** absent or empty: the user is invited by e-mail and sets a password through the link */
  password: z.preprocess((v) => (v === "" || v === null ? undefined : v), passwordSchema.optional()),
});
export type CreateUserInput = z.infer<typeof createUserSchema>;

export const changeRoleSchema = z.object({ role: roleSchema });

export const setActiveSchema = z.object({
  active: z.preprocess(toBoolean, z.boolean({ error: "Say whether the account is active (true or false)." })),
});

/** PATCH /api/v1/admin/users/[id]: a role, an active flag, or both. */
export const updateUserSchema = z
  .object({
    role: roleSchema.optional(),
    active: z
      .preprocess(toBoolean, z.boolean({ error: "Say whether the account is active (true or false)." }))
      .optional(),
  })
  .refine((v) => v.role !== undefined || v.active !== undefined, {
    message: "Send a role, an active flag, or both.",
  });
export type UpdateUserInput = z.infer<typeof updateUserSchema>;

export const changePasswordSchema = z
  .object({
    currentPassword: z
      .string({ error: "Enter your current password." })
      .min(1, "Enter your current password."),
    newPassword: passwordSchema,
    confirmPassword: z.string().optional(),
  })
  .refine((v) => v.confirmPassword === undefined || v.confirmPassword === v.newPassword, {
    path: ["confirmPassword"],
    message: "The two new passwords differ; type the same one twice.",
  })
  .refine((v) => v.newPassword !== v.currentPassword, {
    path: ["newPassword"],
    message: "Choose a password different from the current one.",
  });
export type ChangePasswordInput = z.infer<typeof changePasswordSchema>;

export const userIdSchema = z.coerce
  .number({ error: "A user id is a positive whole number." })
  .int()
  .positive("A user id is a positive whole number.");

// API tokens
export const createApiTokenSchema = z.object({
  name: z
    .string({ error: "Name the token (e.g. 'upload script')." })
    .trim()
    .min(1, "Name the token (e.g. 'upload script').")
    .max(100, "Use at most 100 characters."),
});
export type CreateApiTokenInput = z.infer<typeof createApiTokenSchema>;

export const apiTokenIdSchema = z.coerce
  .number({ error: "A token id is a positive whole number." })
  .int()
  .positive("A token id is a positive whole number.");
