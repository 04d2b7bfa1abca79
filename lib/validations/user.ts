import { z } from "zod";
import { ROLES } from "@/lib/auth/roles";

/** Sign-in form: shared by the sign-in page and the credentials provider. */
export const SignInSchema = z.object({
  email: z.string().trim().toLowerCase().email("Enter an e-mail address."),
  password: z.string().min(1, "Enter your password.").max(200),
});

/** Creating a user (admin). */
export const CreateUserSchema = z.object({
  email: z.string().trim().toLowerCase().email("Enter a valid e-mail address.").max(254),
  name: z.string().trim().min(1, "Enter a name.").max(120),
  role: z.enum(ROLES, { message: "Choose one of the roles." }),
  password: z.string().min(10, "Passwords have at least 10 characters.").max(200),
});
export type CreateUserInput = z.infer<typeof CreateUserSchema>;

/** Changing a user's role (admin). */
export const ChangeRoleSchema = z.object({
  role: z.enum(ROLES, { message: "Choose one of the roles." }),
});
