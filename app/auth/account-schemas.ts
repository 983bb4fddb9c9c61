import { z } from "zod";
import { ROLES } from "./roles";

/** Form and API shapes of the account pages, shared by the forms and the actions. */
export const email = z
  .string({ message: "Enter an e-mail address" })
  .trim()
  .toLowerCase()
  .max(320, "An e-mail address has at most 320 characters")
  .pipe(z.email({ message: "Enter an e-mail address such as name@example.org" }));

// Long passphrases welcome; the upper bound only keeps hashing cheap (NIST SP 800-63B §5.1.1.2
// asks for at least 8 characters and allows at least 64).
export const newPassword = z
  .string({ message: "Choose a password" })
  .min(10, "Use at least 10 characters; a few words together make a good one")
  .max(200, "Use at most 200 characters");

export const personName = z.string({ message: "Enter your name" }).trim().min(1, "Enter your name").max(200, "Use at most 200 characters");

export const signInForm = z.object({
  email,
  password: z.string({ message: "Enter your password" }).min(1, "Enter your password").max(200, "Use at most 200 characters"),
});

export const roleList = z
  .array(z.enum(ROLES, { message: "Unknown role" }), { message: "Choose at least one role" })
  .min(1, "Choose at least one role");

export const inviteForm = z.object({ email, roles: roleList });

export const acceptInvitationForm = z
  .object({ name: personName, password: newPassword, confirmPassword: z.string() })
  .refine((v) => v.password === v.confirmPassword, { path: ["confirmPassword"], message: "The two passwords differ" });

export const signUpForm = z
  .object({ name: personName, email, password: newPassword, confirmPassword: z.string() })
  .refine((v) => v.password === v.confirmPassword, { path: ["confirmPassword"], message: "The two passwords differ" });

export const resetPasswordForm = z
  .object({ password: newPassword, confirmPassword: z.string() })
  .refine((v) => v.password === v.confirmPassword, { path: ["confirmPassword"], message: "The two passwords differ" });

export const profileForm = z.object({ name: personName, email });

export const changePasswordForm = z
  .object({ currentPassword: z.string().min(1, "Enter your current password").max(200), password: newPassword, confirmPassword: z.string() })
  .refine((v) => v.password === v.confirmPassword, { path: ["confirmPassword"], message: "The two passwords differ" });

export const apiTokenForm = z.object({
  label: z.string().trim().min(1, "Give the token a name, such as the script that uses it").max(100, "Use at most 100 characters"),
});

export type FieldErrors = Record<string, string[] | undefined>;

/** zod issues → { field: [messages] } for showing next to inputs. */
export function fieldErrors(error: z.ZodError): FieldErrors {
  return z.flattenError(error).fieldErrors as FieldErrors;
}

/** Reads a form into a plain object; repeated fields (checkboxes) become arrays. */
export function formToObject(form: FormData, arrays: string[] = []): Record<string, unknown> {
  const result: Record<string, unknown> = {};
  for (const key of new Set(form.keys())) {
    const values = form.getAll(key).filter((v): v is string => typeof v === "string");
    result[key] = arrays.includes(key) ? values : values[0];
  }
  for (const key of arrays) result[key] ??= [];
  return result;
}
