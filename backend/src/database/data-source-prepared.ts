/** Anything that runs SQL the TypeORM way: an EntityManager (inside a transaction) or the DataSource. */
interface Queryable {
  query<T = unknown>(query: string, parameters?: unknown[]): Promise<T>;
}

/**
 * Runs `text` as a named prepared statement: each pooled connection has PostgreSQL parse and plan
 * it once, then only binds and executes it. For the statements every request runs (the token
 * check, a saved row of readings) parsing and planning cost about a third of PostgreSQL's CPU per
 * save (bench/save-row.bench.ts, profiled with perf). Nothing is shared between connections or
 * processes: each connection prepares its own copy the first time it runs the name. (A pooler
 * between the app and PostgreSQL in transaction mode must support prepared statements, as
 * PgBouncer does from 1.21 with max_prepared_statements set.)
 *
 * `name` must stand for exactly one `text` for the life of the process. The pg driver takes
 * `{ name, text }` in place of the SQL string and TypeORM hands that argument over unchanged,
 * which its types do not say; hence the cast.
 */
export function queryPrepared<T>(runner: Queryable, name: string, text: string, parameters: unknown[]): Promise<T> {
  return runner.query<T>({ name, text } as unknown as string, parameters);
}
