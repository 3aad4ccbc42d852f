import { char, index, int, json, longtext, mysqlEnum, mysqlTable, text, timestamp, tinyint, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { createdAt, id, ref } from "./columns";
import { traits } from "./traits";
import { plots, trials } from "./trials";
import { sites } from "./sites";
import { users } from "./users";
import { EXCLUSION_CATEGORIES } from "@/lib/domain/vocabulary/enums";

/**
 * An immutable, versioned snapshot of a trial's data and results at publication. A correction is a new
 * version; unpublishing keeps the row and records why.
 */
export const publishedReports = mysqlTable(
  "published_reports",
  {
    id: id(),
    trialId: ref("trial_id").notNull().references(() => trials.id, { onDelete: "restrict" }),
    version: int("version").notNull(),
    // Null when the whole trial is published; set when only one trait is.
    traitId: ref("trait_id").references(() => traits.id, { onDelete: "restrict" }),
    settings: json("settings").notNull(),
    snapshot: longtext("snapshot").notNull(),
    changeNote: text("change_note"),
    storageKey: varchar("storage_key", { length: 200 }),
    publishedById: ref("published_by_id").references(() => users.id, { onDelete: "set null" }),
    publishedAt: timestamp("published_at", { mode: "date" }).notNull().defaultNow(),
    unpublishedAt: timestamp("unpublished_at", { mode: "date" }),
    unpublishReason: text("unpublish_reason"),
  },
  (t) => [uniqueIndex("published_reports_version_unique").on(t.trialId, t.version)],
);

/**
 * One row whose stamp changes, in the same transaction, with every write that changes what the public
 * pages and API show (a publication, a withdrawal, a trial's title). Each app instance keeps rendered
 * public answers in memory tagged with the stamp they were rendered under and reads this row (a primary-key
 * lookup) on every public request, so a change made through any instance is seen by all at their next
 * request (server/publish/public-cache.ts). No row (an emptied database) is a stamp of its own.
 */
export const publicGeneration = mysqlTable("public_generation", {
  id: tinyint("id").primaryKey(),
  stamp: char("stamp", { length: 36 }).notNull(),
  changedAt: timestamp("changed_at", { mode: "date" }).notNull().defaultNow().onUpdateNow(),
});

/**
 * A site or plot left out of an analysis; the data itself is never deleted. The category is the public
 * reason (published with the results); the note is for the program's staff and never leaves the portal.
 */
export const analysisExclusions = mysqlTable(
  "analysis_exclusions",
  {
    id: id(),
    trialId: ref("trial_id").notNull().references(() => trials.id, { onDelete: "cascade" }),
    siteId: ref("site_id").references(() => sites.id, { onDelete: "cascade" }),
    plotId: ref("plot_id").references(() => plots.id, { onDelete: "cascade" }),
    traitId: ref("trait_id").references(() => traits.id, { onDelete: "cascade" }),
    category: mysqlEnum("category", EXCLUSION_CATEGORIES).notNull().default("other"),
    privateNote: text("private_note"),
    createdById: ref("created_by_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [index("analysis_exclusions_trial_idx").on(t.trialId)],
);

export type PublishedReport = typeof publishedReports.$inferSelect;
