import { describe, expect, it } from 'vitest'
import { databaseFailure } from '../../../server/utils/database-errors'

/** Shaped as mysql2 raises them (code, errno, sqlMessage, sql) and knex wraps them (message with the statement). */
function mysqlError(code: string, errno: number, sql: string): Error {
  return Object.assign(new Error(`${sql} - ${code}`), { code, errno, sqlMessage: 'refused', sql })
}

describe('database errors', () => {
  it('calls a refused connection unreachable, and summarises it by code', () => {
    const refused = Object.assign(new Error('connect ECONNREFUSED 127.0.0.1:3306'), { code: 'ECONNREFUSED', errno: -111 })
    expect(databaseFailure(new Error('wrapped', { cause: refused }))).toEqual({ unreachable: true, summary: 'ECONNREFUSED (-111)' })
  })

  it('calls the pool timeout unreachable', () => {
    const timeout = Object.assign(new Error('Knex: Timeout acquiring a connection.'), { name: 'KnexTimeoutError' })
    expect(databaseFailure(timeout)?.unreachable).toBe(true)
  })

  it('keeps a refused statement apart from an outage, and never repeats the statement', () => {
    const sql = 'insert into `attempts` (`events`) values (\'[{"note":60,"secret":"LOGMARKER"}]\')'
    const failure = databaseFailure(new Error('h3', { cause: mysqlError('ER_TRUNCATED_WRONG_VALUE', 1292, sql) }))
    expect(failure).toEqual({ unreachable: false, summary: 'ER_TRUNCATED_WRONG_VALUE (1292)' })
  })

  it('leaves errors that are not the database\'s alone', () => {
    expect(databaseFailure(new TypeError('x is undefined'))).toBeNull()
    expect(databaseFailure(Object.assign(new Error('not found'), { statusCode: 404 }))).toBeNull()
  })
})
