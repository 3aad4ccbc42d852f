import type { GrowingSetup, Role, TrialStatus } from "@/db/schema/enums";

export const ROLE_LABELS: Record<Role, string> = { admin: "Administrator", coordinator: "Coordinator", cooperator: "Partner grower" };

export const STATUS_LABELS: Record<TrialStatus, string> = {
  draft: "Draft",
  open: "Open",
  collecting: "Collecting data",
  analysing: "Analysing",
  published: "Published",
  archived: "Archived",
};

export const SETUP_LABELS: Record<GrowingSetup, string> = {
  indoor_lights: "Indoors under lights",
  greenhouse: "Greenhouse",
  high_tunnel: "High tunnel",
  field: "Field",
};

/** Formats an ISO date as e.g. "Tue 1 Dec 2026" without time-zone drift. */
export function formatDate(iso: string | null | undefined): string {
  if (!iso) return "—";
  const d = new Date(`${iso.slice(0, 10)}T00:00:00Z`);
  return d.toLocaleDateString("en-GB", { weekday: "short", day: "numeric", month: "short", year: "numeric", timeZone: "UTC" });
}
