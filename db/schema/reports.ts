import { index, int, json, longtext, mysqlEnum, mysqlTable, text, timestamp, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
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
