import { boolean, decimal, json, mysqlEnum, mysqlTable, text, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { createdAt, id } from "./columns";
import { TRAIT_COMPUTATIONS, TRAIT_TYPES } from "./enums";

/**
 * The trait library. `dueDaysAfterSowing` lists the days on which a repeated count is due
 * (e.g. [5, 7, 10, 14] for emergence); `dueNote` describes other timing ("at first harvest").
 */
export const traits = mysqlTable(
  "traits",
  {
    id: id(),
    code: varchar("code", { length: 40 }).notNull(),
    name: varchar("name", { length: 120 }).notNull(),
    unit: varchar("unit", { length: 40 }),
    valueType: mysqlEnum("value_type", TRAIT_TYPES).notNull(),
    minValue: decimal("min_value", { precision: 14, scale: 4, mode: "number" }),
    maxValue: decimal("max_value", { precision: 14, scale: 4, mode: "number" }),
    dueDaysAfterSowing: json("due_days_after_sowing").$type<number[]>(),
    dueNote: varchar("due_note", { length: 200 }),
    computation: mysqlEnum("computation", TRAIT_COMPUTATIONS).notNull().default("none"),
    description: text("description"),
    builtIn: boolean("built_in").notNull().default(false),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("traits_code_unique").on(t.code)],
);

export type Trait = typeof traits.$inferSelect;
