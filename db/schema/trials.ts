import { boolean, date, index, int, mysqlEnum, mysqlTable, smallint, text, timestamp, uniqueIndex, varchar, type AnyMySqlColumn } from "drizzle-orm/mysql-core";
import { createdAt, id, ref, updatedAt } from "./columns";
import { BETTER_WHEN, PLOT_UNITS, TRIAL_DESIGNS, TRIAL_STATUSES } from "@/lib/domain/vocabulary/enums";
import { crops, seedLots, varieties } from "./catalogue";
import { programs, seasons } from "./programs";
import { traits } from "./traits";
import { sites } from "./sites";
import { users } from "./users";

export const trials = mysqlTable(
  "trials",
  {
    id: id(),
    programId: ref("program_id").notNull().references(() => programs.id, { onDelete: "restrict" }),
    seasonId: ref("season_id").notNull().references(() => seasons.id, { onDelete: "restrict" }),
    cropId: ref("crop_id").notNull().references(() => crops.id, { onDelete: "restrict" }),
    code: varchar("code", { length: 40 }).notNull(),
    title: varchar("title", { length: 200 }).notNull(),
    purpose: text("purpose"),
    design: mysqlEnum("design", TRIAL_DESIGNS).notNull().default("rcbd"),
    blocks: smallint("blocks").notNull(),
    plotUnit: mysqlEnum("plot_unit", PLOT_UNITS).notNull().default("insert"),
    // Cells per plot for tray units, plants per plot for bed rows.
    plotSize: smallint("plot_size").notNull().default(6),
    seedsPerCell: smallint("seeds_per_cell").notNull().default(1),
    protocol: text("protocol"),
    status: mysqlEnum("status", TRIAL_STATUSES).notNull().default("draft"),
    createdById: ref("created_by_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    /** the trial this one was planned from (rolled forward into the next season) */
    previousTrialId: ref("previous_trial_id").references((): AnyMySqlColumn => trials.id, { onDelete: "set null" }),
    updatedAt: updatedAt(),
  },
  (t) => [
    uniqueIndex("trials_code_unique").on(t.code),
    index("trials_program_season_idx").on(t.programId, t.seasonId),
    index("trials_status_idx").on(t.status),
  ],
);

/** Traits recorded in a trial, in display order. */
export const trialTraits = mysqlTable(
  "trial_traits",
  {
    id: id(),
    trialId: ref("trial_id").notNull().references(() => trials.id, { onDelete: "cascade" }),
    traitId: ref("trait_id").notNull().references(() => traits.id, { onDelete: "restrict" }),
    sortOrder: smallint("sort_order").notNull().default(0),
    /** this trial's direction for the trait; null follows the trait library */
    betterWhen: mysqlEnum("better_when", BETTER_WHEN),
  },
  (t) => [uniqueIndex("trial_traits_unique").on(t.trialId, t.traitId)],
);

/** A variety (and seed lot) entered in a trial, known to growers only by its blind code. */
export const trialEntries = mysqlTable(
  "trial_entries",
  {
    id: id(),
    trialId: ref("trial_id").notNull().references(() => trials.id, { onDelete: "cascade" }),
    varietyId: ref("variety_id").notNull().references(() => varieties.id, { onDelete: "restrict" }),
    seedLotId: ref("seed_lot_id").references(() => seedLots.id, { onDelete: "restrict" }),
    blindCode: varchar("blind_code", { length: 8 }).notNull(),
    entryNumber: smallint("entry_number").notNull(),
    isCheck: boolean("is_check").notNull().default(false),
  },
  (t) => [
    uniqueIndex("trial_entries_code_unique").on(t.trialId, t.blindCode),
    uniqueIndex("trial_entries_variety_unique").on(t.trialId, t.varietyId),
    uniqueIndex("trial_entries_number_unique").on(t.trialId, t.entryNumber),
  ],
);

/** A site taking part in a trial, with the cooperator responsible and its own randomisation seed. */
export const enrolments = mysqlTable(
  "enrolments",
  {
    id: id(),
    trialId: ref("trial_id").notNull().references(() => trials.id, { onDelete: "cascade" }),
    siteId: ref("site_id").notNull().references(() => sites.id, { onDelete: "restrict" }),
    cooperatorId: ref("cooperator_id").references(() => users.id, { onDelete: "set null" }),
    sownOn: date("sown_on", { mode: "string" }),
    transplantedOn: date("transplanted_on", { mode: "string" }),
    randomSeed: int("random_seed", { unsigned: true }),
    randomisedAt: timestamp("randomised_at", { mode: "date" }),
    // The coordinator's choice to show this site's own analysis to its cooperators (never other sites').
    resultsShared: boolean("results_shared").notNull().default(false),
    /** the grower agreed to the site being named in public results; without it the site is "Site N, region" */
    namedInResults: boolean("named_in_results").notNull().default(false),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex("enrolments_trial_site_unique").on(t.trialId, t.siteId),
    index("enrolments_cooperator_idx").on(t.cooperatorId),
  ],
);

/** One plot: an entry in a block at a site. `position` orders plots within the block (layout order). */
export const plots = mysqlTable(
  "plots",
  {
    id: id(),
    enrolmentId: ref("enrolment_id").notNull().references(() => enrolments.id, { onDelete: "cascade" }),
    trialId: ref("trial_id").notNull().references(() => trials.id, { onDelete: "cascade" }),
    siteId: ref("site_id").notNull().references(() => sites.id, { onDelete: "restrict" }),
    entryId: ref("entry_id").notNull().references(() => trialEntries.id, { onDelete: "restrict" }),
    plotCode: varchar("plot_code", { length: 24 }).notNull(),
    block: smallint("block").notNull(),
    position: smallint("position").notNull(),
    tray: smallint("tray"),
    traySlot: smallint("tray_slot"),
  },
  (t) => [
    uniqueIndex("plots_code_unique").on(t.trialId, t.plotCode),
    uniqueIndex("plots_layout_unique").on(t.enrolmentId, t.block, t.position),
    index("plots_entry_idx").on(t.entryId),
    index("plots_site_idx").on(t.siteId, t.trialId),
  ],
);

export type Trial = typeof trials.$inferSelect;
export type NewTrial = typeof trials.$inferInsert;
export type TrialEntry = typeof trialEntries.$inferSelect;
export type Enrolment = typeof enrolments.$inferSelect;
export type Plot = typeof plots.$inferSelect;
