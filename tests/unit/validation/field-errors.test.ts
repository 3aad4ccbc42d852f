import { describe, expect, it } from "vitest";
import { z } from "zod";
import { fieldErrorsOf, parseIn } from "@/lib/validation/field-errors";
import { translatorFor, type Translator } from "@/lib/domain/i18n/catalogue";

describe("field errors from a zod failure", () => {
  it("puts every message under its own field, in order, and form-wide ones under _form", () => {
    const schema = z
      .object({ email: z.string().email("Enter an e-mail address.").min(40, "Too short."), rows: z.array(z.number("Not a number.")) })
      .refine(() => false, "The form as a whole is wrong.");
    const parsed = schema.safeParse({ email: "x", rows: [1, "a"] });
    expect(parsed.success).toBe(false);
    expect(fieldErrorsOf(parsed.error!)).toEqual({ email: ["Enter an e-mail address.", "Too short."], rows: ["Not a number."] });
    const whole = z.object({ a: z.string() }).refine(() => false, "The form as a whole is wrong.").safeParse({ a: "ok" });
    expect(fieldErrorsOf(whole.error!)).toEqual({ _form: ["The form as a whole is wrong."] });
  });

  it("zod's own issues and a schema built from the reader's Translator come out in the reader's language", () => {
    const schema = (t: Translator) => z.object({ name: z.string().trim().min(1).max(5), count: z.number().max(3), caption: z.string().max(3, t("forms.atMostChars", { max: "3" })) });
    const input = { count: 9, caption: "long" };
    const spanish = parseIn(schema, input, translatorFor("es"));
    expect(fieldErrorsOf(spanish.error!)).toEqual({ name: ["Este campo es obligatorio."], count: ["Escriba un número no mayor que 3."], caption: ["Use como máximo 3 caracteres."] });
    const english = parseIn(schema, { ...input, name: "far too long" });
    expect(fieldErrorsOf(english.error!)).toEqual({ name: ["Use at most 5 characters."], count: ["Enter a number of at most 3."], caption: ["Use at most 3 characters."] });
    expect(parseIn(schema, { name: "ok", count: 1, caption: "ab" }, translatorFor("es")).data).toEqual({ name: "ok", count: 1, caption: "ab" });
  });
});

describe("schemas built in the reader's language", () => {
  it("a schema is built once per language and each language keeps its own words", () => {
    const built: string[] = [];
    const schema = (t: Translator) => {
      built.push(t.locale);
      return z.object({ caption: z.string().max(3, t("forms.atMostChars", { max: "3" })) });
    };
    for (let i = 0; i < 3; i += 1) {
      expect(fieldErrorsOf(parseIn(schema, { caption: "long" }, translatorFor("es")).error!)).toEqual({ caption: ["Use como máximo 3 caracteres."] });
      expect(fieldErrorsOf(parseIn(schema, { caption: "long" }, translatorFor("en")).error!)).toEqual({ caption: ["Use at most 3 characters."] });
    }
    expect(built).toEqual(["es", "en"]);
  });
});
