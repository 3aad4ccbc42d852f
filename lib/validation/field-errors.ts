import type { z } from "zod";

/** Zod's issues as the form's field errors: every message under its top-level field ("_form" when none). */
export function fieldErrorsOf(error: z.ZodError): Record<string, string[]> {
  const fieldErrors: Record<string, string[]> = {};
  for (const issue of error.issues) (fieldErrors[String(issue.path[0] ?? "_form")] ??= []).push(issue.message);
  return fieldErrors;
}
