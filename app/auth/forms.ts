import { z } from "zod";

export const signUpSchema = z.object({
  name: z.string({ error: "Tell us your name or handle." }).trim().min(2, "At least 2 characters.").max(80, "At most 80 characters."),
  email: z.email({ error: "An e-mail address, like you@example.org." }),
  password: z.string({ error: "Choose a password." }).min(10, "At least 10 characters.").max(128, "At most 128 characters."),
});

export const signInSchema = z.object({
  email: z.email({ error: "An e-mail address, like you@example.org." }),
  password: z.string({ error: "Your password." }).min(1, "Your password."),
  next: z.string().optional(),
});

export const forgotSchema = z.object({ email: z.email({ error: "An e-mail address, like you@example.org." }) });

export const resetSchema = z.object({
  token: z.string().min(1),
  password: z.string({ error: "Choose a password." }).min(10, "At least 10 characters.").max(128, "At most 128 characters."),
});
