import { z } from "zod";

/** The three roles, lowest first: contributors enter and edit, reviewers resolve flags and accept, admins manage users and settings. */
export const ROLE_NAMES = ["contributor", "reviewer", "admin"] as const;

/** Minimum password length (NIST SP 800-63B §5.1.1.2 asks for at least 8; 10 here, common practice for shared servers). */
export const MIN_PASSWORD_LENGTH = 10;
/** Upper bound so a hash is never asked to chew through megabytes (SP 800-63B allows a limit of 64 or more). */
export const MAX_PASSWORD_LENGTH = 256;

export const userNameSchema = z
  .string({ error: "Give a user name." })
  .trim()
  .min(2, "A user name has at least 2 characters.")
  .max(64, "A user name has at most 64 characters.")
  .regex(/^[\p{L}\p{N}][\p{L}\p{N} ._@-]*$/u, "Use letters, digits, spaces, dots, dashes, underscores or @ (starting with a letter or digit).");

export const passwordSchema = z
  .string({ error: "Give a password." })
  .min(MIN_PASSWORD_LENGTH, `A password has at least ${MIN_PASSWORD_LENGTH} characters.`)
  .max(MAX_PASSWORD_LENGTH, `A password has at most ${MAX_PASSWORD_LENGTH} characters.`);

export const roleSchema = z.enum(ROLE_NAMES, { error: "Choose contributor, reviewer or admin." });

/** A new account: the password is optional (an account without one cannot log in until it is set). */
export const newUserSchema = z.object({
  name: userNameSchema,
  role: roleSchema,
  password: passwordSchema.optional(),
});
export type NewUserInput = z.input<typeof newUserSchema>;

export const loginSchema = z.object({
  name: z.string({ error: "Give your user name." }).trim().min(1, "Give your user name.").max(64, "No such user name."),
  password: z.string({ error: "Give your password." }).min(1, "Give your password.").max(MAX_PASSWORD_LENGTH, "Wrong user name or password."),
});

const id = z.coerce.number({ error: "Not a user id." }).int("Not a user id.").positive("Not a user id.");

/** An admin's change to one account: any of role, disabled, password. */
export const userChangeSchema = z
  .object({
    id,
    role: roleSchema.optional(),
    disabled: z.boolean().optional(),
    password: passwordSchema.optional(),
    reason: z.string().trim().max(500).optional(),
  })
  .refine((v) => v.role !== undefined || v.disabled !== undefined || v.password !== undefined, { message: "Nothing to change.", path: ["_form"] });
