import { describe, expect, it } from "vitest";
import { z } from "zod";
import { fieldErrorsOf } from "@/lib/validation/field-errors";

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
});
