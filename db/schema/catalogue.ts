import { boolean, date, decimal, index, int, mysqlEnum, mysqlTable, text, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { createdAt, id, ref } from "./columns";
import { CROP_GROUPS } from "@/lib/domain/vocabulary/enums";
import { programs } from "./programs";

/** Crops are one list shared by every program; what a program grows is its own varieties. */
export const crops = mysqlTable(
  "crops",
  {
    id: id(),
    name: varchar("name", { length: 80 }).notNull(),
    cropGroup: mysqlEnum("crop_group", CROP_GROUPS).notNull(),
    scientificName: varchar("scientific_name", { length: 120 }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("crops_name_unique").on(t.name)],
);

/** A program's own variety (with its seed lots); other programs neither see nor change it. */
export const varieties = mysqlTable(
  "varieties",
  {
    id: id(),
    programId: ref("program_id").notNull().references(() => programs.id, { onDelete: "restrict" }),
    cropId: ref("crop_id").notNull().references(() => crops.id, { onDelete: "restrict" }),
    name: varchar("name", { length: 120 }).notNull(),
    description: text("description"),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("varieties_program_crop_name_unique").on(t.programId, t.cropId, t.name), index("varieties_crop_idx").on(t.cropId)],
);

/** A packet or bag of seed of one variety. Label germination is null when the label does not state it. */
export const seedLots = mysqlTable(
  "seed_lots",
  {
    id: id(),
    varietyId: ref("variety_id").notNull().references(() => varieties.id, { onDelete: "restrict" }),
    source: varchar("source", { length: 120 }).notNull(),
    lotCode: varchar("lot_code", { length: 60 }).notNull(),
    labelGerminationPct: decimal("label_germination_pct", { precision: 5, scale: 2, mode: "number" }),
    germinationTestDate: date("germination_test_date", { mode: "string" }),
    packetDaysToMaturity: int("packet_days_to_maturity"),
    treated: boolean("treated").notNull().default(false),
    treatment: varchar("treatment", { length: 160 }),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex("seed_lots_variety_source_lot_unique").on(t.varietyId, t.source, t.lotCode),
    index("seed_lots_variety_idx").on(t.varietyId),
  ],
);

export type Crop = typeof crops.$inferSelect;
export type Variety = typeof varieties.$inferSelect;
export type SeedLot = typeof seedLots.$inferSelect;
