import type { z } from "zod";
import { translatorFor, type Translator } from "@/lib/domain/i18n/catalogue";

// Every message a form or route shows from zod comes through here, in the reader's language: a schema a grower
// fills in is built with the reader's Translator (its own words from the catalogue), and zod's own issues
// that a schema leaves unworded (a field left out, a wrong type) come from the catalogue's "forms" messages.

/** A schema, or one built in the reader's language from a Translator (and from nothing else: parseIn keeps it per language). */
export type SchemaIn<S extends z.ZodType> = S | ((t: Translator) => S);

/** Zod's own issues in the reader's language; a schema's own message always comes first. */
export function catalogueErrorMap(t: Translator): z.ZodErrorMap {
  return (issue) => {
    switch (issue.code) {
      case "invalid_type":
        if (issue.input === undefined || issue.input === null) return t("forms.required");
        return issue.expected === "number" || issue.expected === "int" ? t("forms.expectedNumber") : t("forms.invalidType");
      case "too_small": {
        const minimum = String(issue.minimum);
        if (issue.origin === "string") return Number(issue.minimum) <= 1 ? t("forms.required") : t("forms.tooShort", { minimum });
        if (issue.origin === "array" || issue.origin === "set") return t("forms.tooFew", { minimum });
        return t("forms.tooLow", { minimum });
      }
      case "too_big": {
        const maximum = String(issue.maximum);
        if (issue.origin === "string") return t("forms.tooLong", { maximum });
        if (issue.origin === "array" || issue.origin === "set") return t("forms.tooMany", { maximum });
        return t("forms.tooHigh", { maximum });
      }
      case "invalid_format":
        return issue.format === "email" ? t("forms.email") : t("forms.badFormat");
      case "invalid_value":
        return t("forms.chooseOption");
      default:
        return t("forms.invalid");
    }
  };
}

/**
 * Schemas already built, per schema function and Translator. Building one (and zod's compiling of its object
 * parsers on first use) cost more than parsing a save's body with it, on every request. A schema function
 * depends on the Translator alone, and there is one Translator per language, so each language's schema is
 * built once and never goes stale; a function made on the fly is forgotten with it.
 */
const builtSchemas = new WeakMap<(t: Translator) => z.ZodType, WeakMap<Translator, z.ZodType>>();
const errorMaps = new WeakMap<Translator, z.ZodErrorMap>();

function schemaIn<S extends z.ZodType>(schema: (t: Translator) => S, t: Translator): S {
  let byTranslator = builtSchemas.get(schema);
  if (!byTranslator) builtSchemas.set(schema, (byTranslator = new WeakMap()));
  let built = byTranslator.get(t) as S | undefined;
  if (!built) byTranslator.set(t, (built = schema(t)));
  return built;
}

/** Parses input with a schema in the reader's language (English when no Translator is given). */
export function parseIn<S extends z.ZodType>(schema: SchemaIn<S>, input: unknown, t: Translator = translatorFor()) {
  const built = typeof schema === "function" ? schemaIn(schema, t) : schema;
  let errorMap = errorMaps.get(t);
  if (!errorMap) errorMaps.set(t, (errorMap = catalogueErrorMap(t)));
  return built.safeParse(input, { error: errorMap }) as z.ZodSafeParseResult<z.output<S>>;
}

/** Zod's issues as the form's field errors: every message under its top-level field ("_form" when none). */
export function fieldErrorsOf(error: z.ZodError): Record<string, string[]> {
  const fieldErrors: Record<string, string[]> = {};
  for (const issue of error.issues) (fieldErrors[String(issue.path[0] ?? "_form")] ??= []).push(issue.message);
  return fieldErrors;
}
