import { boolean, index, int, mysqlEnum, mysqlTable, timestamp, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { createdAt, id, ref, updatedAt } from "./columns";
import { LOCALES, ROLES, TOKEN_KINDS } from "@/lib/domain/vocabulary/enums";

export const users = mysqlTable(
  "users",
  {
    id: id(),
    email: varchar("email", { length: 254 }).notNull(),
    name: varchar("name", { length: 120 }).notNull(),
    role: mysqlEnum("role", ROLES).notNull(),
    // Null until an invited person sets a password.
    passwordHash: varchar("password_hash", { length: 255 }),
    phone: varchar("phone", { length: 40 }),
    // The language of the person's screens, mails and printouts; each person sets their own.
    locale: mysqlEnum("locale", LOCALES).notNull().default("en"),
    active: boolean("active").notNull().default(true),
    // Each session carries the value it was issued with; raising it (sign-out, a new password,
    // deactivation) ends every session issued before.
    sessionGeneration: int("session_generation").notNull().default(0),
    lastSignedInAt: timestamp("last_signed_in_at", { mode: "date" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [uniqueIndex("users_email_unique").on(t.email), index("users_role_idx").on(t.role)],
);

/** One-time links for invitations and password resets; only a SHA-256 of the token is stored. */
export const userTokens = mysqlTable(
  "user_tokens",
  {
    id: id(),
    userId: ref("user_id").notNull().references(() => users.id, { onDelete: "cascade" }),
    kind: mysqlEnum("kind", TOKEN_KINDS).notNull(),
    tokenHash: varchar("token_hash", { length: 64 }).notNull(),
    expiresAt: timestamp("expires_at", { mode: "date" }).notNull(),
    usedAt: timestamp("used_at", { mode: "date" }),
    createdById: ref("created_by_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("user_tokens_hash_unique").on(t.tokenHash), index("user_tokens_user_idx").on(t.userId, t.kind)],
);

/** Sign-in attempts, kept to throttle guessing per account and per network address. */
export const signInAttempts = mysqlTable(
  "sign_in_attempts",
  {
    id: id(),
    throttleKey: varchar("throttle_key", { length: 300 }).notNull(),
    succeeded: boolean("succeeded").notNull(),
    attemptedAt: timestamp("attempted_at", { mode: "date" }).notNull().defaultNow(),
  },
  (t) => [index("sign_in_attempts_key_idx").on(t.throttleKey, t.attemptedAt)],
);

export type User = typeof users.$inferSelect;
export type NewUser = typeof users.$inferInsert;
export type UserToken = typeof userTokens.$inferSelect;
