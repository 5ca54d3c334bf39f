// Knex settings shared by the command line (migrations, seeds) and the app's server (server/utils/db.ts).
import type { Knex } from 'knex'

export interface DbConnection {
  host: string
  port: number
  user: string
  password: string
  database: string
}

export function knexConfig(connection: DbConnection, pool = { min: 0, max: 10 }): Knex.Config {
  return {
    client: 'mysql2',
    connection: {
      ...connection,
      charset: 'utf8mb4',
      // Store and read DATETIME columns as UTC whatever the server's zone.
      timezone: 'Z',
      dateStrings: false,
    },
    pool,
    // A database that does not answer fails a request within seconds (a 503), instead of the default minute.
    acquireConnectionTimeout: 10_000,
    migrations: {
      directory: './migrations',
      extension: 'ts',
      loadExtensions: ['.ts'],
      tableName: 'knex_migrations',
    },
    seeds: {
      directory: './seeds',
      extension: 'ts',
      loadExtensions: ['.ts'],
    },
  }
}

/** The command line reads the same NUXT_DB_* variables that fill the app's runtimeConfig. */
export function connectionFromEnv(env: NodeJS.ProcessEnv = process.env): DbConnection {
  return {
    host: env.NUXT_DB_HOST ?? '127.0.0.1',
    port: Number(env.NUXT_DB_PORT ?? 3306),
    user: env.NUXT_DB_USER ?? 'evenhand',
    password: env.NUXT_DB_PASSWORD ?? 'evenhand',
    database: env.NUXT_DB_DATABASE ?? 'evenhand',
  }
}

export default knexConfig(connectionFromEnv(), { min: 0, max: 2 })
