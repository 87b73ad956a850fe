// Form schemas shared by the browser (quick feedback) and the server (the real check).
import { z } from "zod";
import { ROLES } from "./permissions";

const email = z.string().trim().toLowerCase().pipe(z.email("Enter an e-mail address such as name@firm.example"));
const newPassword = z
  .string()
  .min(10, "Use at least 10 characters")
  .max(128, "Use at most 128 characters");

export const signInSchema = z.object({
  email,
  password: z.string().min(1, "Enter your password"),
  redirectTo: z.string().optional(),
});

export const signUpSchema = z.object({
  name: z.string().trim().min(1, "Enter your name").max(100, "At most 100 characters"),
  email,
  password: newPassword,
});

export const forgotPasswordSchema = z.object({ email });

export const passwordChangeSchema = z.object({
  currentPassword: z.string().min(1, "Enter your current password"),
  newPassword,
});

export const resetPasswordSchema = z
  .object({ token: z.string().min(1, "The reset link is incomplete"), password: newPassword, confirm: z.string() })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords differ" });

export const inviteSchema = z.object({ email, role: z.enum(ROLES, "Pick a role") });
export const roleChangeSchema = z.object({ userId: z.string().min(1), role: z.enum(ROLES, "Pick a role") });

export const projectSchema = z.object({
  code: z
    .string()
    .trim()
    .min(2, "A code has 2 to 24 characters")
    .max(24, "A code has 2 to 24 characters")
    .regex(/^[A-Za-z0-9][A-Za-z0-9._-]*$/, "Use letters, digits, dot, dash or underscore"),
  name: z.string().trim().min(1, "Give the project a name").max(120, "At most 120 characters"),
  client: z.string().trim().max(120, "At most 120 characters").optional().transform((v) => v || undefined),
  description: z.string().trim().max(2000, "At most 2000 characters").optional().transform((v) => v || undefined),
});
export type ProjectInput = z.infer<typeof projectSchema>;

export const apiKeySchema = z.object({ name: z.string().trim().min(1, "Give the key a name").max(80, "At most 80 characters") });

export type FieldErrors = Record<string, string>;

/** zod issues as one message per field, the shape the forms render. */
export function fieldErrors(error: z.ZodError): FieldErrors {
  const out: FieldErrors = {};
  for (const i of error.issues) {
    const k = i.path.map(String).join(".") || "form";
    out[k] ??= i.message;
  }
  return out;
}

export function formObject(form: FormData): Record<string, string> {
  const o: Record<string, string> = {};
  for (const [k, v] of form) if (typeof v === "string") o[k] = v;
  return o;
}
