import { boolean, decimal, json, mysqlEnum, mysqlTable, smallint, text, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { createdAt, id, ref } from "./columns";
import { BETTER_WHEN, TRAIT_COMPUTATIONS, TRAIT_TYPES } from "@/lib/domain/vocabulary/enums";
import { programs } from "./programs";

/**
 * The trait library. `dueDaysAfterSowing` lists the days on which a repeated count is due
 * (e.g. [5, 7, 10, 14] for emergence); `dueNote` describes other timing ("at first harvest").
 * Built-in traits (no program) are shared and read-only; a coordinator's own traits belong to their program.
 * A custom code is unique within its program and never repeats a built-in code (checked on write).
 */
export const traits = mysqlTable(
  "traits",
  {
    id: id(),
    programId: ref("program_id").references(() => programs.id, { onDelete: "restrict" }),
    code: varchar("code", { length: 40 }).notNull(),
    name: varchar("name", { length: 120 }).notNull(),
    unit: varchar("unit", { length: 40 }),
    valueType: mysqlEnum("value_type", TRAIT_TYPES).notNull(),
    minValue: decimal("min_value", { precision: 14, scale: 4, mode: "number" }),
    maxValue: decimal("max_value", { precision: 14, scale: 4, mode: "number" }),
    dueDaysAfterSowing: json("due_days_after_sowing").$type<number[]>(),
    dueNote: varchar("due_note", { length: 200 }),
    /** for a trait recorded once: the day after sowing by which it is due (null: timed by an event, see dueNote) */
    dueByDay: smallint("due_by_day"),
    computation: mysqlEnum("computation", TRAIT_COMPUTATIONS).notNull().default("none"),
    /** the library's default direction; a trial may set its own on trial_traits */
    betterWhen: mysqlEnum("better_when", BETTER_WHEN).notNull().default("neither"),
    description: text("description"),
    builtIn: boolean("built_in").notNull().default(false),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("traits_program_code_unique").on(t.programId, t.code)],
);

export type Trait = typeof traits.$inferSelect;
