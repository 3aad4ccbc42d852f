import { LOCALES } from "@/lib/domain/vocabulary/enums";
import { z } from "zod";

export const email = z
  .string({ error: "Enter your e-mail address." })
  .trim()
  .toLowerCase()
  .min(1, "Enter your e-mail address.")
  .max(254, "That e-mail address is too long.")
  .pipe(z.email({ error: "Enter an e-mail address like name@example.org." }));

export const signInSchema = z.object({
  email,
  password: z.string({ error: "Enter your password." }).min(1, "Enter your password.").max(200, "That password is too long."),
});

export const newPasswordSchema = z
  .object({
    password: z
      .string({ error: "Choose a password." })
      .min(10, "Use at least 10 characters.")
      .max(200, "Use at most 200 characters."),
    confirm: z.string({ error: "Type the password again." }),
  })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords are not the same." });

export const tokenSchema = z.string().regex(/^[A-Za-z0-9_-]{32,64}$/, "This link is not valid.");

/** The language of the page a signed-out form was sent from (its `?lang=`), for the words of the answer. */
const pageLanguage = z.enum(LOCALES).catch("en");

export const acceptInviteSchema = z.intersection(
  newPasswordSchema,
  z.object({
    lang: pageLanguage,
    token: tokenSchema,
    name: z.string().trim().min(2, "Enter your name.").max(120, "Use at most 120 characters."),
  }),
);

export const resetPasswordSchema = z.intersection(newPasswordSchema, z.object({ token: tokenSchema, lang: pageLanguage }));

export const forgotPasswordSchema = z.object({ email, lang: pageLanguage });

// A grower is always invited to a site: the site's program is what lets its coordinators see them.
export const inviteCooperatorSchema = z.object({
  name: z.string({ error: "Enter the grower's name." }).trim().min(2, "Enter the grower's name.").max(120, "Use at most 120 characters."),
  email,
  siteId: z.coerce.number({ error: "Choose the grower's site." }).int("Choose the grower's site.").positive("Choose the grower's site."),
  /** the language of the invitation mail and of the new account */
  locale: z.enum(LOCALES, { error: "Choose English or Spanish." }).default("en"),
});

export const changeRoleSchema = z.object({
  userId: z.coerce.number().int().positive(),
  role: z.enum(["admin", "coordinator", "cooperator"], { error: "Choose admin, coordinator or cooperator." }),
});

export const setActiveSchema = z.object({
  userId: z.coerce.number().int().positive(),
  active: z.enum(["true", "false"]).transform((v) => v === "true"),
});
