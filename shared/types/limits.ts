import { z } from 'zod'

// What MariaDB can store, so that no value that passes validation fails at the insert instead.

/** MariaDB's TIMESTAMP holds 1970-01-01 00:00:01 to 2038-01-19 03:14:07 UTC (MariaDB manual, "TIMESTAMP"). */
export const TIMESTAMP_MIN = Date.UTC(1970, 0, 1, 0, 0, 1)
export const TIMESTAMP_MAX = Date.UTC(2038, 0, 19, 3, 14, 7)

/** An ISO 8601 date-time with its offset that a TIMESTAMP column can hold. */
export const StoredTimestamp = z.iso.datetime({ offset: true }).refine((text) => {
  const ms = Date.parse(text)
  return ms >= TIMESTAMP_MIN && ms <= TIMESTAMP_MAX
}, { error: 'must lie between 1970 and 2038' })

/** INT UNSIGNED (MariaDB manual, "INT"). */
export const INT_UNSIGNED_MAX = 4_294_967_295

/** A row id: BIGINT UNSIGNED here, bounded by what JavaScript counts exactly. */
export const RowId = z.number().int().positive().max(Number.MAX_SAFE_INTEGER)
