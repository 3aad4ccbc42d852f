import { index, json, mysqlTable, timestamp, varchar } from "drizzle-orm/mysql-core";
import { id, ref } from "./columns";
import { users } from "./users";

/** Who changed what and when, with old and new values; written in the same transaction as the change. */
export const auditLog = mysqlTable(
  "audit_log",
  {
    id: id(),
    actorId: ref("actor_id").references(() => users.id, { onDelete: "set null" }),
    action: varchar("action", { length: 60 }).notNull(),
    entity: varchar("entity", { length: 40 }).notNull(),
    entityId: varchar("entity_id", { length: 40 }).notNull(),
    trialId: ref("trial_id"),
    oldValue: json("old_value"),
    newValue: json("new_value"),
    at: timestamp("at", { mode: "date", fsp: 3 }).notNull().defaultNow(),
  },
  (t) => [index("audit_log_entity_idx").on(t.entity, t.entityId), index("audit_log_trial_idx").on(t.trialId, t.at)],
);
