"use client";
import { useActionState } from "react";
import { setSitePrintLanguage } from "@/server/actions/sites";
import type { Locale } from "@/lib/domain/vocabulary/enums";

/** One site's printout language, saved as soon as it is chosen (staff only; coordinator screens stay English). */
export function PrintLanguageForm({ siteId, siteName, current }: { siteId: number; siteName: string; current: Locale | null }) {
  const [state, action, pending] = useActionState(setSitePrintLanguage, null);
  return (
    <form action={action} className="flex items-center gap-2">
      <input type="hidden" name="siteId" value={siteId} />
      <label className="sr-only" htmlFor={`print-locale-${siteId}`}>
        Printout language for {siteName}
      </label>
      <select
        id={`print-locale-${siteId}`}
        name="printLocale"
        defaultValue={current ?? ""}
        disabled={pending}
        onChange={(e) => e.currentTarget.form?.requestSubmit()}
        className="min-h-11 rounded-lg border border-loam-300 bg-white px-2 text-sm"
      >
        <option value="">Reader's language</option>
        <option value="en">English</option>
        <option value="es">Español</option>
      </select>
      <span aria-live="polite" className="text-xs text-loam-700">
        {state ? (state.ok ? "Saved" : state.formError) : ""}
      </span>
    </form>
  );
}
