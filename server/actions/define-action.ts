import "server-only";
import type { z } from "zod";
import { getViewer } from "@/server/auth/guards";
import { asAppError } from "@/lib/errors";
import type { Role } from "@/lib/domain/vocabulary/enums";
import type { Viewer } from "@/lib/domain/viewer";
import type { ActionResult } from "@/lib/validation/action-result";
import { fieldErrorsOf, parseIn, type SchemaIn } from "@/lib/validation/field-errors";
import { localeOr, translatorFor } from "@/lib/domain/i18n/catalogue";

// Fields never echoed back to the form after a failure.
const SECRET_FIELDS = new Set(["password", "confirm", "token"]);

function echoValues(formData: FormData): Record<string, string> {
  const values: Record<string, string> = {};
  for (const [key, value] of formData.entries()) {
    if (typeof value === "string" && !SECRET_FIELDS.has(key) && !key.startsWith("$")) values[key] = value;
  }
  return values;
}

function formToObject(formData: FormData): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [key, value] of formData.entries()) if (typeof value === "string" && !key.startsWith("$")) out[key] = value;
  return out;
}

/**
 * Wraps a form action: checks the viewer's role (roles empty = anyone, even signed out), validates the
 * form with zod, runs the body, and maps AppErrors to a form message. Unknown errors are logged and
 * shown as a generic message; nothing the body wrote survives an error because bodies use one transaction.
 * Its own messages and zod's are in the signed-in person's language (a schema built from a Translator gets
 * theirs); a body words its confirmation with translatorFor(viewer.locale).
 */
export function defineAction<S extends z.ZodType, V extends Viewer | null = Viewer>(
  options: { roles: Role[] | "public"; schema: SchemaIn<S> },
  body: (input: z.infer<S>, viewer: V) => Promise<ActionResult | void>,
) {
  return async (_previous: ActionResult | null, formData: FormData): Promise<ActionResult> => {
    const values = echoValues(formData);
    let t = translatorFor();
    try {
      const viewer = await getViewer();
      // A signed-out form (sign-in, reset, invitation) sends its page's language as `lang`.
      t = translatorFor(viewer ? viewer.locale : localeOr(formData.get("lang")));
      if (options.roles !== "public") {
        if (!viewer) return { ok: false, formError: t("forms.sessionEnded"), values };
        if (!options.roles.includes(viewer.role)) return { ok: false, formError: t("forms.noAccess"), values };
      }
      const parsed = parseIn(options.schema, formToObject(formData), t);
      if (!parsed.success) {
        return { ok: false, fieldErrors: fieldErrorsOf(parsed.error), formError: t("forms.correctMarked"), values };
      }
      const result = await body(parsed.data, viewer as V);
      return result ?? { ok: true };
    } catch (e) {
      const known = asAppError(e);
      if (known) return { ok: false, formError: known.message, fieldErrors: known.fieldErrors, values };
      // redirect() and notFound() signal by throwing; let Next handle them.
      if (e && typeof e === "object" && "digest" in e) throw e;
      console.error("[action] unexpected error", e);
      return { ok: false, formError: t("forms.somethingWrong"), values };
    }
  };
}
