import type { Viewer } from "./viewer";

// Row rules as pure predicates: actions use them to enforce, the UI to hide controls.

/** Coordinators and admins run the program: trials, sites, invitations. */
export const isStaff = (viewer: Viewer | null): boolean => viewer?.role === "coordinator" || viewer?.role === "admin";

export const canManageUsers = (viewer: Viewer | null): boolean => viewer?.role === "admin";

export const canInviteCooperators = (viewer: Viewer | null): boolean => isStaff(viewer);

/** A cooperator may record data only for sites they are attached to; staff may for any site. */
export const canRecordForSite = (viewer: Viewer | null, site: { cooperatorIds: number[] }): boolean =>
  viewer !== null && (isStaff(viewer) || (viewer.role === "cooperator" && site.cooperatorIds.includes(viewer.id)));

/** A cooperator's phone and e-mail are for staff and the cooperators of the same site only. */
export const canSeeSiteContact = (viewer: Viewer | null, site: { cooperatorIds: number[] }): boolean =>
  canRecordForSite(viewer, site);

/** The blind-code key (which variety is behind each code) stays with staff until publication. */
export const canSeeBlindKey = (viewer: Viewer | null, trial: { status: string }): boolean =>
  isStaff(viewer) || trial.status === "published";

/** Admins may change roles, but not their own, so the last admin cannot lock everyone out by mistake. */
export const canChangeRole = (viewer: Viewer | null, target: { id: number }): boolean =>
  canManageUsers(viewer) && viewer!.id !== target.id;
