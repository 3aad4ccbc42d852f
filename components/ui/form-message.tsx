import type { ActionResult } from "@/lib/validation/action-result";

/** Form-level outcome in a polite live region, so screen readers hear it after submit. */
export function FormMessage({ state }: { state: ActionResult | null }) {
  return (
    <div aria-live="polite" role="status">
      {state && !state.ok && state.formError && (
        <p className="rounded-lg border border-beet-600 bg-beet-50 px-3 py-2 text-sm font-medium text-beet-700">{state.formError}</p>
      )}
      {state && state.ok && state.message && (
        <p className="rounded-lg border border-sprout-500 bg-sprout-50 px-3 py-2 text-sm font-medium text-sprout-700">{state.message}</p>
      )}
    </div>
  );
}
