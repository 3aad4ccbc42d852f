import { sql, type SQL } from "drizzle-orm";
import { MySqlDialect } from "drizzle-orm/mysql-core";

// The app's Drizzle instance (db/client.ts) uses the dialect's defaults, so this one renders names as it does.
const dialect = new MySqlDialect();

/**
 * A piece of a hot statement that never changes (tables, columns, joins; no values), turned into SQL text once,
 * when the module loads. Drizzle renders a template chunk by chunk on every run, and for the statements every
 * save runs that cost more than the rest of their work in this process; the piece keeps the schema's names.
 * Values go around it in the statement's `sql` template, as parameters.
 */
export function fixedSql(piece: SQL): SQL {
  const { sql: text, params } = dialect.sqlToQuery(piece);
  if (params.length > 0) throw new Error("fixedSql takes no values: put them in the statement around it");
  return sql.raw(text);
}
