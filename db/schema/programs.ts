import { date, int, mysqlTable, text, timestamp, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { createdAt, id, ref } from "./columns";
import { users } from "./users";

/** An extension program (e.g. a district's vegetable variety network) that runs trials season by season. */
export const programs = mysqlTable(
  "programs",
  {
    id: id(),
    slug: varchar("slug", { length: 80 }).notNull(),
    name: varchar("name", { length: 160 }).notNull(),
    description: text("description"),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("programs_slug_unique").on(t.slug)],
);

/** Coordinators who run a program; scoping of coordinator queries starts here. */
export const programCoordinators = mysqlTable(
  "program_coordinators",
  {
    id: id(),
    programId: ref("program_id").notNull().references(() => programs.id, { onDelete: "cascade" }),
    userId: ref("user_id").notNull().references(() => users.id, { onDelete: "cascade" }),
  },
  (t) => [uniqueIndex("program_coordinators_unique").on(t.programId, t.userId)],
);

export const seasons = mysqlTable(
  "seasons",
  {
    id: id(),
    programId: ref("program_id").notNull().references(() => programs.id, { onDelete: "restrict" }),
    name: varchar("name", { length: 80 }).notNull(),
    year: int("year").notNull(),
    startsOn: date("starts_on", { mode: "string" }),
    endsOn: date("ends_on", { mode: "string" }),
    // Set when the season is closed: it then takes no new trials (its trials carry on as they are).
    closedAt: timestamp("closed_at", { mode: "date" }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("seasons_program_name_unique").on(t.programId, t.name)],
);

export type Program = typeof programs.$inferSelect;
export type Season = typeof seasons.$inferSelect;
