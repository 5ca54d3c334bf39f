import knex from 'knex'
import type { Knex } from 'knex'
import { knexConfig } from '../../knexfile'

let instance: Knex | undefined

/** The one Knex instance of this server process, made on first use from runtimeConfig. */
export function useDb(): Knex {
  if (!instance) {
    const { db } = useRuntimeConfig()
    instance = knex(knexConfig({ ...db, port: Number(db.port) }))
  }
  return instance
}

/** mysql2 hands MariaDB's JSON columns back as text (MariaDB stores JSON as LONGTEXT). */
export function parseJson<T>(value: unknown): T {
  return (typeof value === 'string' ? JSON.parse(value) : value) as T
}

interface PreparedConnection {
  execute: (sql: string, values: unknown[], done: (error: Error | null) => void) => void
}

/**
 * One row inserted through a prepared statement on a connection of Knex's pool: the values travel in
 * MariaDB's binary protocol rather than escaped into the statement's text. For an attempt's 30 kB of JSON,
 * escaping took a fifth of a millisecond of each save and gave MariaDB as much text to read again (the
 * load test's profile, DEVELOPERS.md "Load test"). mysql2 keeps each connection's prepared statements,
 * so a statement is prepared once per connection. Its errors name the statement with `?` for each value.
 */
export async function insertPrepared(db: Knex, table: string, row: Record<string, unknown>): Promise<void> {
  const columns = Object.keys(row)
  const sql = `INSERT INTO \`${table}\` (${columns.map(c => `\`${c}\``).join(', ')}) VALUES (${columns.map(() => '?').join(', ')})`
  const connection: PreparedConnection = await db.client.acquireConnection()
  try {
    await new Promise<void>((resolve, reject) => connection.execute(sql, columns.map(c => row[c] ?? null), error => (error ? reject(error) : resolve())))
  }
  finally {
    await db.client.releaseConnection(connection)
  }
}
