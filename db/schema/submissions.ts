import { index, mysqlEnum, mysqlTable, text, timestamp, uniqueIndex } from "drizzle-orm/mysql-core";
import { createdAt, id, ref, updatedAt } from "./columns";
import { SUBMISSION_STATUSES } from "@/lib/domain/vocabulary/enums";
import { observations } from "./observations";
import { enrolments, plots } from "./trials";
import { users } from "./users";

/** A site's data set for a trial, moving draft -> submitted -> accepted (or back to returned). */
export const submissions = mysqlTable(
  "submissions",
  {
    id: id(),
    enrolmentId: ref("enrolment_id").notNull().references(() => enrolments.id, { onDelete: "cascade" }),
    status: mysqlEnum("status", SUBMISSION_STATUSES).notNull().default("draft"),
    submittedAt: timestamp("submitted_at", { mode: "date" }),
    submittedById: ref("submitted_by_id").references(() => users.id, { onDelete: "set null" }),
    reviewedAt: timestamp("reviewed_at", { mode: "date" }),
    reviewedById: ref("reviewed_by_id").references(() => users.id, { onDelete: "set null" }),
    reviewComment: text("review_comment"),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [uniqueIndex("submissions_enrolment_unique").on(t.enrolmentId), index("submissions_status_idx").on(t.status)],
);

/** A coordinator's comment on a returned data set, optionally pinned to a plot or a single value. */
export const reviewComments = mysqlTable(
  "review_comments",
  {
    id: id(),
    submissionId: ref("submission_id").notNull().references(() => submissions.id, { onDelete: "cascade" }),
    plotId: ref("plot_id").references(() => plots.id, { onDelete: "cascade" }),
    observationId: ref("observation_id").references(() => observations.id, { onDelete: "cascade" }),
    body: text("body").notNull(),
    authorId: ref("author_id").references(() => users.id, { onDelete: "set null" }),
    resolvedAt: timestamp("resolved_at", { mode: "date" }),
    createdAt: createdAt(),
  },
  (t) => [index("review_comments_submission_idx").on(t.submissionId)],
);

export type Submission = typeof submissions.$inferSelect;
