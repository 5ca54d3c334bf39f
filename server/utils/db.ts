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
