// Attempts as a student's browser would send them, for the API, fault and load tests.
import { randomUUID } from 'node:crypto'
import { Note } from 'tonal'
import { gradeAttempt } from '../../shared/engine'
import type { DrillNote } from '../../shared/types/drill'
import type { PlayedEvent } from '../../shared/types/attempt'
import type { Knex } from 'knex'
import type { Client } from './server'

export interface DrillReply { drill: { id: number, version: number, tempoBpm: number, notes: DrillNote[] }, targets: { assignmentId: number, targetTempoBpm: number | null }[] }

/** An even, exact performance of a drill at a tempo. */
export function play(notes: DrillNote[], bpm: number): PlayedEvent[] {
  const beatMs = 60_000 / bpm
  return notes.flatMap(n => [
    { note: Note.midi(n.pitch)!, on: true, velocity: 70, timeMs: n.beat * beatMs },
    { note: Note.midi(n.pitch)!, on: false, timeMs: (n.beat + n.length * 0.95) * beatMs },
  ]).sort((a, b) => a.timeMs - b.timeMs)
}

/**
 * A grade as the server stores it, for rows a test inserts straight into `attempts`: every reader
 * (lists, progress, the figures MariaDB derives) expects a whole grade, never an empty object.
 */
export function storedResult(): string {
  const notes: DrillNote[] = ['C4', 'D4', 'E4', 'F4', 'G4'].map((pitch, i) => ({ pitch, beat: i, length: 1, finger: (i + 1) as DrillNote['finger'] }))
  return JSON.stringify(gradeAttempt({ hand: 'right', tempoBpm: 60, notes }, play(notes, 60)))
}

/** The drill a student practises in these tests: the demo's C major scale, with its assignment. */
export async function scaleDrill(student: Client): Promise<DrillReply> {
  const list = await student.get<{ drills: { id: number, title: string }[] }>('/api/drills')
  const id = list.body.drills.find(d => d.title === 'C major scale, right hand')!.id
  return (await student.get<DrillReply>(`/api/drills/${id}`)).body
}

export function attemptBody(drill: DrillReply, overrides: Record<string, unknown> = {}): Record<string, unknown> {
  return {
    id: randomUUID(),
    drillId: drill.drill.id,
    drillVersion: drill.drill.version,
    assignmentId: drill.targets[0]?.assignmentId ?? null,
    startedAt: new Date().toISOString(),
    tempoBpm: 72,
    inputDevice: 'midi',
    deviceName: 'Test keyboard',
    events: play(drill.drill.notes, 72),
    ...overrides,
  }
}

/**
 * Makes stored attempt rows fit to insert again: JSON columns (which mysql2 may hand back parsed) as text, and
 * without the columns MariaDB derives from each grade (migration 84), which refuse a value of their own.
 */
export async function attemptRowCopier(db: Knex): Promise<(row: Record<string, unknown>) => Record<string, unknown>> {
  const [columns] = await db.raw('SELECT COLUMN_NAME AS name FROM information_schema.COLUMNS WHERE TABLE_SCHEMA = DATABASE() AND TABLE_NAME = \'attempts\' AND IS_GENERATED = \'ALWAYS\'')
  const generated = new Set((columns as { name: string }[]).map(c => c.name))
  return row => Object.fromEntries(Object.entries(row)
    .filter(([key]) => !generated.has(key))
    .map(([key, v]) => [key, v !== null && typeof v === 'object' && !(v instanceof Date) ? JSON.stringify(v) : v]))
}
