import { describe, expect, it } from "vitest";
import { sql } from "drizzle-orm";
import { MySqlDialect } from "drizzle-orm/mysql-core";
import { fixedSql } from "@/db/fixed-sql";
import { plots, trials } from "@/db/schema";

describe("fixed pieces of hot statements", () => {
  const dialect = new MySqlDialect();

  it("a fixed piece reads as Drizzle writes it, and the values around it stay parameters", () => {
    const piece = sql`SELECT ${plots.id} FROM ${plots} WHERE ${plots.enrolmentId} = `;
    const statement = dialect.sqlToQuery(sql`${fixedSql(piece)}${7} AND ${plots.id} IN ${[1, 2]}`);
    expect(statement.sql).toBe(`${dialect.sqlToQuery(piece).sql}? AND \`plots\`.\`id\` IN (?, ?)`);
    expect(statement.params).toEqual([7, 1, 2]);
  });

  it("refuses a value, which would otherwise be fixed into the text for every later call", () => {
    expect(() => fixedSql(sql`SELECT ${trials.id} FROM ${trials} WHERE ${trials.id} = ${5}`)).toThrow(/no values/);
  });
});
