"use server";
import "server-only";
import { revalidatePath } from "next/cache";
import { defineAction } from "./define-action";
import { changeRoleSchema, inviteCooperatorSchema, setActiveSchema } from "@/lib/validation/auth";
import { updateUserActive, updateUserRole } from "@/db/mutations/users";
import { inviteGrower } from "@/server/users/invitations";
import { assignPrograms, cancelInvitation, inviteStaff, resendInvitation } from "@/server/users/staff";
import { coordinatorProgramsSchema, invitationSchema, inviteStaffSchema } from "@/lib/validation/users";
import { ROLE_LABELS } from "@/lib/domain/vocabulary/labels";
import { deliverSoon } from "@/server/mail/outbox";
import { canChangeRole } from "@/lib/domain/permissions";
import { AppError } from "@/lib/errors";
import { consumeRateLimit } from "@/server/auth/throttle";

/** A coordinator invites a partner grower by e-mail to one of their program's sites. */
export const inviteCooperator = defineAction({ roles: ["coordinator", "admin"], schema: inviteCooperatorSchema }, async (input, viewer) => {
  const allowed = await consumeRateLimit(
    [
      { key: `invite-by:${viewer.id}`, max: 40 },
      { key: `invite-to:${input.email}`, max: 3 },
    ],
    60,
  );
  if (!allowed) throw new AppError("too_many_requests", "Too many invitations in the last hour. Please wait before sending more.");
  const { invited } = await inviteGrower({ viewer, name: input.name, email: input.email, siteId: input.siteId, locale: input.locale, noticeForAccount: true });
  await deliverSoon();
  revalidatePath("/portal/cooperators");
  revalidatePath("/portal/sites");
  return { ok: true, message: invited ? `Invitation sent to ${input.email}.` : `${input.email} already has a Seedplot account, so they were added to the site and told by e-mail.` };
});

export const changeUserRole = defineAction({ roles: ["admin"], schema: changeRoleSchema }, async (input, viewer) => {
  if (!canChangeRole(viewer, { id: input.userId })) throw new AppError("forbidden", "You cannot change your own role.");
  await updateUserRole({ actorId: viewer.id, userId: input.userId, role: input.role });
  revalidatePath("/portal/admin/users");
  return { ok: true, message: "Role updated." };
});

export const setUserActive = defineAction({ roles: ["admin"], schema: setActiveSchema }, async (input, viewer) => {
  if (!canChangeRole(viewer, { id: input.userId })) throw new AppError("forbidden", "You cannot deactivate your own account.");
  await updateUserActive({ actorId: viewer.id, userId: input.userId, active: input.active });
  revalidatePath("/portal/admin/users");
  return { ok: true, message: input.active ? "Account activated." : "Account deactivated." };
});

/** Rate limits shared by every invitation an admin sends, so a stolen admin session cannot mail-bomb. */
async function allowInvitation(viewerId: number, email: string | null) {
  const allowed = await consumeRateLimit([{ key: `invite-by:${viewerId}`, max: 40 }, ...(email ? [{ key: `invite-to:${email}`, max: 3 }] : [])], 60);
  if (!allowed) throw new AppError("too_many_requests", "Too many invitations in the last hour. Please wait before sending more.");
}

/** An administrator invites a coordinator (of chosen programs) or another administrator by e-mail. */
export const inviteStaffMember = defineAction({ roles: ["admin"], schema: inviteStaffSchema }, async (input, viewer) => {
  await allowInvitation(viewer.id, input.email);
  await inviteStaff({ viewer, name: input.name, email: input.email, role: input.role, programIds: input.programIds });
  await deliverSoon();
  revalidatePath("/portal/admin/users");
  return { ok: true, message: `Invitation sent to ${input.email} as ${ROLE_LABELS[input.role].toLowerCase()}. The link works for 7 days.` };
});

export const resendUserInvitation = defineAction({ roles: ["admin"], schema: invitationSchema }, async (input, viewer) => {
  await allowInvitation(viewer.id, null);
  const { email } = await resendInvitation({ viewer, userId: input.userId });
  await deliverSoon();
  revalidatePath("/portal/admin/users");
  return { ok: true, message: `A new invitation link was sent to ${email}. Earlier links no longer work.` };
});

export const cancelUserInvitation = defineAction({ roles: ["admin"], schema: invitationSchema }, async (input, viewer) => {
  const { name } = await cancelInvitation({ viewer, userId: input.userId });
  revalidatePath("/portal/admin/users");
  return { ok: true, message: `${name}'s invitation is cancelled; the link no longer works.` };
});

export const setCoordinatorPrograms = defineAction({ roles: ["admin"], schema: coordinatorProgramsSchema }, async (input, viewer) => {
  const { name } = await assignPrograms({ viewer, userId: input.userId, programIds: input.programIds });
  revalidatePath("/portal/admin/users");
  return { ok: true, message: input.programIds.length === 0 ? `${name} no longer runs any program.` : `${name}'s programs were saved.` };
});
