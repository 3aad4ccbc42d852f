import { mysqlTable, timestamp, varchar } from "drizzle-orm/mysql-core";

/**
 * One row per periodic job (reminders, cleanup). Every app instance runs the same timers; the instance that
 * takes the lease runs the job and the others skip it. The lease holds for the job's period after a run, so
 * it runs once per period across instances; a holder that dies mid-run leaves a short lease that expires,
 * and another instance takes the job over. Times come from the database's clock, never an instance's.
 */
export const jobLeases = mysqlTable("job_leases", {
  name: varchar("name", { length: 60 }).primaryKey(),
  holder: varchar("holder", { length: 120 }).notNull(),
  expiresAt: timestamp("expires_at", { mode: "date", fsp: 3 }).notNull(),
});
