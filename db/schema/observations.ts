import { date, decimal, index, mediumtext, mysqlEnum, mysqlTable, smallint, text, timestamp, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { createdAt, id, ref, updatedAt } from "./columns";
import { MISSING_REASONS } from "@/lib/domain/vocabulary/enums";
import { traits } from "./traits";
import { plots } from "./trials";
import { users } from "./users";

/**
 * One recorded value. `occasion` separates repeated observations of a trait on the same plot: the day
 * after sowing for scheduled counts (emergence on days 5, 7, 10, 14), 0 for a trait recorded once.
 * Exactly one of the value columns is used, chosen by the trait's type; a missing plot has none and a reason.
 */
export const observations = mysqlTable(
  "observations",
  {
    id: id(),
    plotId: ref("plot_id").notNull().references(() => plots.id, { onDelete: "cascade" }),
    traitId: ref("trait_id").notNull().references(() => traits.id, { onDelete: "restrict" }),
    occasion: smallint("occasion").notNull().default(0),
    observedOn: date("observed_on", { mode: "string" }),
    valueNumber: decimal("value_number", { precision: 14, scale: 4, mode: "number" }),
    valueDate: date("value_date", { mode: "string" }),
    valueText: varchar("value_text", { length: 1000 }),
    missingReason: mysqlEnum("missing_reason", MISSING_REASONS),
    note: text("note"),
    recordedById: ref("recorded_by_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex("observations_plot_trait_occasion_unique").on(t.plotId, t.traitId, t.occasion),
    index("observations_trait_idx").on(t.traitId),
    // Covers the analysis's read of a trial's values and its data-version fingerprint (db/queries/analysis.ts),
    // which reach every observation of a trial through its plots: without it each row is a second lookup.
    index("observations_plot_values_idx").on(t.plotId, t.traitId, t.occasion, t.valueNumber, t.valueDate, t.missingReason, t.updatedAt),
  ],
);

/** Earlier values of an observation, written whenever it changes, so a corrected upload never erases history. */
export const observationHistory = mysqlTable(
  "observation_history",
  {
    id: id(),
    observationId: ref("observation_id").notNull().references(() => observations.id, { onDelete: "cascade" }),
    valueNumber: decimal("value_number", { precision: 14, scale: 4, mode: "number" }),
    valueDate: date("value_date", { mode: "string" }),
    valueText: varchar("value_text", { length: 1000 }),
    changedById: ref("changed_by_id").references(() => users.id, { onDelete: "set null" }),
    changedAt: timestamp("changed_at", { mode: "date" }).notNull().defaultNow(),
  },
  (t) => [index("observation_history_obs_idx").on(t.observationId)],
);

export type Observation = typeof observations.$inferSelect;

/**
 * The answer to a save the phone sent with its own id, kept so that a save sent again (the phone lost the
 * answer, or went offline before it came) is answered the same and written once. Ids belong to their user:
 * another user's id is simply a different save.
 */
export const clientSaves = mysqlTable(
  "client_saves",
  {
    id: id(),
    userId: ref("user_id").notNull().references(() => users.id, { onDelete: "cascade" }),
    clientSaveId: varchar("client_save_id", { length: 36 }).notNull(),
    trialId: ref("trial_id").notNull(),
    siteId: ref("site_id").notNull(),
    answer: mediumtext("answer").notNull(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("client_saves_user_id_unique").on(t.userId, t.clientSaveId)],
);
