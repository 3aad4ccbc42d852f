import "server-only";
import { auditLog } from "./schema";
import type { Tx } from "./index";

/** Writes one audit entry inside the caller's transaction, so the change and its record land together. */
export async function insertAudit(
  tx: Tx,
  entry: { actorId: number | null; action: string; entity: string; entityId: number | string; trialId?: number | null; oldValue?: unknown; newValue?: unknown },
) {
  await tx.insert(auditLog).values({
    actorId: entry.actorId,
    action: entry.action,
    entity: entry.entity,
    entityId: String(entry.entityId),
    trialId: entry.trialId ?? null,
    oldValue: entry.oldValue ?? null,
    newValue: entry.newValue ?? null,
  });
}
