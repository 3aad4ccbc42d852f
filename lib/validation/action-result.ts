/** The one result shape every form action returns. Never carries passwords or tokens back. */
export type ActionResult =
  | { ok: true; message?: string }
  | { ok: false; formError?: string; fieldErrors?: Record<string, string[]>; values?: Record<string, string> };

export const initialResult: ActionResult | null = null;
