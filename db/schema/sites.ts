import { decimal, index, mysqlEnum, mysqlTable, text, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { createdAt, id, ref, updatedAt } from "./columns";
import { GROWING_SETUPS, LOCALES, SITE_KINDS } from "@/lib/domain/vocabulary/enums";
import { users } from "./users";
import { programs } from "./programs";

/**
 * A partner farm or garden, run with exactly one program: only that program's coordinators see its contacts,
 * invite its growers and enrol it. Contact fields are private; `publicDescription` is what the public may see.
 */
export const sites = mysqlTable(
  "sites",
  {
    id: id(),
    programId: ref("program_id").notNull().references(() => programs.id, { onDelete: "restrict" }),
    name: varchar("name", { length: 160 }).notNull(),
    kind: mysqlEnum("kind", SITE_KINDS).notNull(),
    region: varchar("region", { length: 120 }).notNull(),
    latitude: decimal("latitude", { precision: 9, scale: 6, mode: "number" }),
    longitude: decimal("longitude", { precision: 9, scale: 6, mode: "number" }),
    growingSetup: mysqlEnum("growing_setup", GROWING_SETUPS).notNull(),
    soil: varchar("soil", { length: 160 }),
    irrigation: varchar("irrigation", { length: 160 }),
    publicDescription: text("public_description"),
    // The language of the site's printouts (field sheets, labels, tray maps, packing lists); null prints in the
    // language of whoever prints them.
    printLocale: mysqlEnum("print_locale", LOCALES),
    contactName: varchar("contact_name", { length: 120 }),
    contactEmail: varchar("contact_email", { length: 254 }),
    contactPhone: varchar("contact_phone", { length: 40 }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [uniqueIndex("sites_program_name_unique").on(t.programId, t.name)],
);

/** Cooperators (partner growers) who may record data for a site. */
export const siteCooperators = mysqlTable(
  "site_cooperators",
  {
    id: id(),
    siteId: ref("site_id").notNull().references(() => sites.id, { onDelete: "cascade" }),
    userId: ref("user_id").notNull().references(() => users.id, { onDelete: "cascade" }),
  },
  (t) => [uniqueIndex("site_cooperators_unique").on(t.siteId, t.userId), index("site_cooperators_user_idx").on(t.userId)],
);

export type Site = typeof sites.$inferSelect;
