import { boolean, date, index, int, mysqlTable, varchar } from "drizzle-orm/mysql-core";
import { createdAt, id, ref } from "./columns";
import { enrolments, plots } from "./trials";
import { users } from "./users";

/** A photo of a plot or a site visit; the bytes live in the storage backend under `storageKey`. */
export const photos = mysqlTable(
  "photos",
  {
    id: id(),
    enrolmentId: ref("enrolment_id").notNull().references(() => enrolments.id, { onDelete: "cascade" }),
    plotId: ref("plot_id").references(() => plots.id, { onDelete: "cascade" }),
    storageKey: varchar("storage_key", { length: 200 }).notNull(),
    contentType: varchar("content_type", { length: 60 }).notNull(),
    bytes: int("bytes").notNull(),
    caption: varchar("caption", { length: 300 }),
    takenOn: date("taken_on", { mode: "string" }),
    keptLocation: boolean("kept_location").notNull().default(false),
    uploadedById: ref("uploaded_by_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [index("photos_enrolment_idx").on(t.enrolmentId), index("photos_plot_idx").on(t.plotId)],
);
