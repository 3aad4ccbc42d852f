import { int, timestamp } from "drizzle-orm/mysql-core";

/** Surrogate key shared by every table: a plain auto-increment int, so foreign keys match in type. */
export const id = () => int("id").primaryKey().autoincrement();

/** Foreign-key column to another table's `id`. */
export const ref = (name: string) => int(name);

export const createdAt = () => timestamp("created_at", { mode: "date" }).notNull().defaultNow();
export const updatedAt = () =>
  timestamp("updated_at", { mode: "date" }).notNull().defaultNow().onUpdateNow();
