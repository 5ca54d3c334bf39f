import type { Knex } from 'knex'
import type { DrillNote } from '#shared/types/drill'

export interface DrillRow {
  id: number
  owner_id: number
  title: string
  description: string | null
  kind: string
  hand: 'right' | 'left' | 'both'
  key_signature: string | null
  meter: string
  tempo_bpm: number
  notes: unknown
  source: string
  version: number
  is_public: number | boolean
  created_at: Date
  updated_at: Date
}

export interface DrillSummary {
  id: number
  title: string
  description: string | null
  kind: string
  hand: 'right' | 'left' | 'both'
  key: string | null
  meter: string
  tempoBpm: number
  source: string
  version: number
  isPublic: boolean
  ownerId: number
  noteCount: number
  updatedAt: string
}

export interface DrillDetail extends DrillSummary {
  notes: DrillNote[]
}

export function toDrillDetail(row: DrillRow): DrillDetail {
  const notes = parseJson<DrillNote[]>(row.notes)
  return {
    id: Number(row.id),
    title: row.title,
    description: row.description,
    kind: row.kind,
    hand: row.hand,
    key: row.key_signature,
    meter: row.meter,
    tempoBpm: row.tempo_bpm,
    source: row.source,
    version: row.version,
    isPublic: Boolean(row.is_public),
    ownerId: Number(row.owner_id),
    noteCount: notes.length,
    updatedAt: new Date(row.updated_at).toISOString(),
    notes,
  }
}

export function toDrillSummary(row: DrillRow): DrillSummary {
  const { notes: _notes, ...summary } = toDrillDetail(row)
  return summary
}

/** The notes a drill had at `version`, for grading an attempt against what the student actually saw. */
export async function drillVersion(db: Knex, drillId: number, version: number): Promise<{ hand: DrillRow['hand'], tempoBpm: number, notes: DrillNote[] } | undefined> {
  const row = await db('drill_versions').where({ drill_id: drillId, version }).first()
  return row && { hand: row.hand, tempoBpm: row.tempo_bpm, notes: parseJson<DrillNote[]>(row.notes) }
}
