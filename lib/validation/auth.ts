import { LOCALES } from "@/lib/domain/vocabulary/enums";
import { z } from "zod";
import { translatorFor, type Messages, type Translator } from "@/lib/domain/i18n/catalogue";

/** The words of the sign-in and password forms' checks, from the catalogue's "auth.check" in the page's language. */
export type AuthCheckWords = (key: keyof Messages["auth"]["check"]) => string;

/** The checks' words from a Translator (server side; a client form passes its own `useTranslations("auth.check")`). */
export const authCheckWords =
  (t: Translator): AuthCheckWords =>
  (key) =>
    t(`auth.check.${key}`);

export const emailIn = (w: AuthCheckWords) =>
  z
    .string({ error: w("enterEmail") })
    .trim()
    .toLowerCase()
    .min(1, w("enterEmail"))
    .max(254, w("emailTooLong"))
    .pipe(z.email({ error: w("emailLike") }));

const englishChecks = authCheckWords(translatorFor("en"));

/** Staff forms (inviting a grower) stay English. */
export const email = emailIn(englishChecks);

export const signInFields = (w: AuthCheckWords) =>
  z.object({
    email: emailIn(w),
    password: z.string({ error: w("enterPassword") }).min(1, w("enterPassword")).max(200, w("passwordTooLong")),
  });

export const signInSchema = (t: Translator) => signInFields(authCheckWords(t));

const newPasswordIn = (w: AuthCheckWords) =>
  z
    .object({
      password: z.string({ error: w("choosePassword") }).min(10, w("passwordTooShort")).max(200, w("passwordMax")),
      confirm: z.string({ error: w("typeAgain") }),
    })
    .refine((v) => v.password === v.confirm, { path: ["confirm"], message: w("passwordsDiffer") });

const tokenIn = (w: AuthCheckWords) => z.string().regex(/^[A-Za-z0-9_-]{32,64}$/, w("linkInvalid"));
/** A link's token read from the address by the reset and invitation pages (which show their own words for a bad one). */
export const tokenSchema = tokenIn(englishChecks);

/** The language of the page a signed-out form was sent from (its `?lang=`), for the words of the answer. */
const pageLanguage = z.enum(LOCALES).catch("en");

// The signed-out forms below are parsed in the language their page sent as `lang` (see defineAction).
export const acceptInviteSchema = (t: Translator) => {
  const w = authCheckWords(t);
  return z.intersection(
    newPasswordIn(w),
    z.object({
      lang: pageLanguage,
      token: tokenIn(w),
      name: z.string().trim().min(2, w("enterName")).max(120, w("nameMax")),
    }),
  );
};

export const resetPasswordSchema = (t: Translator) => {
  const w = authCheckWords(t);
  return z.intersection(newPasswordIn(w), z.object({ token: tokenIn(w), lang: pageLanguage }));
};

export const forgotPasswordSchema = (t: Translator) => z.object({ email: emailIn(authCheckWords(t)), lang: pageLanguage });

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
