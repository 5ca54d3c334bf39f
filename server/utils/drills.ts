import type { H3Event } from 'h3'
import type { Knex } from 'knex'
import type { User } from '#auth-utils'
import { ImportError, NotationError, exportDrillMusicXml, exportDrillSmf, importDrillFile, parseMeter, parseNotation, type DrillFileOptions, type DrillFilePreview } from '#shared/engine'
import { DrillIdParams } from '#shared/types/drill'
import type { DrillHand, DrillInput, DrillListQuery, DrillNote, DrillPatch } from '#shared/types/drill'

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
  level: number | null
  tags: unknown
  archived_at: Date | null
  copied_from_id: number | null
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
  level: number | null
  tags: string[]
  archived: boolean
  copiedFromId: number | null
  noteCount: number
  updatedAt: string
}

export interface DrillDetail extends DrillSummary {
  notes: DrillNote[]
}

type SummaryRow = Omit<DrillRow, 'notes'> & { note_count: number }

export function toDrillSummary(row: SummaryRow | DrillRow): DrillSummary {
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
    level: row.level ?? null,
    tags: parseJson<string[] | null>(row.tags ?? null) ?? [],
    archived: row.archived_at !== null && row.archived_at !== undefined,
    copiedFromId: row.copied_from_id === null || row.copied_from_id === undefined ? null : Number(row.copied_from_id),
    noteCount: 'note_count' in row ? Number(row.note_count) : parseJson<DrillNote[]>(row.notes).length,
    updatedAt: new Date(row.updated_at).toISOString(),
  }
}

export function toDrillDetail(row: DrillRow): DrillDetail {
  return { ...toDrillSummary(row), notes: parseJson<DrillNote[]>(row.notes) }
}

/** The notes a drill had at `version`, for grading an attempt against what the student actually saw. */
export async function drillVersion(db: Knex, drillId: number, version: number): Promise<{ hand: DrillRow['hand'], tempoBpm: number, meter: string, notes: DrillNote[] } | undefined> {
  // The metre is the drill's (versions keep the notes); a part's bars are counted in it.
  const row = await db('drill_versions as v').join('drills as d', 'd.id', 'v.drill_id')
    .where({ 'v.drill_id': drillId, 'v.version': version }).first('v.hand', 'v.tempo_bpm', 'v.notes', 'd.meter')
  return row && { hand: row.hand, tempoBpm: row.tempo_bpm, meter: row.meter, notes: parseJson<DrillNote[]>(row.notes) }
}

const SUMMARY_COLUMNS = ['id', 'owner_id', 'title', 'description', 'kind', 'hand', 'key_signature', 'meter', 'tempo_bpm', 'source', 'version', 'is_public', 'level', 'tags', 'archived_at', 'copied_from_id', 'created_at', 'updated_at']

/** LIKE's own wildcards taken literally. */
const likeText = (text: string): string => `%${text.replace(/[\\%_]/g, c => `\\${c}`)}%`

/**
 * The library as a user sees it. A teacher's `drills` are their own (archived ones only when asked),
 * and `shared` the public drills of other teachers, a library to copy from; a student's `drills`
 * are the ones assigned to them and the public ones.
 */
export async function listDrills(db: Knex, user: User, query: DrillListQuery): Promise<{ drills: DrillSummary[], shared: DrillSummary[] }> {
  const filtered = (q: Knex.QueryBuilder): Knex.QueryBuilder => q
    .select(SUMMARY_COLUMNS.map(c => `d.${c}`))
    .select(db.raw('JSON_LENGTH(d.notes) AS note_count'))
    .modify((b) => {
      if (query.q) {
        const like = likeText(query.q.toLowerCase())
        b.where(w => w.whereRaw('LOWER(d.title) LIKE ?', [like]).orWhereRaw('JSON_SEARCH(d.tags, \'one\', ?) IS NOT NULL', [like]))
      }
      if (query.hand) b.where('d.hand', query.hand)
      if (query.level) b.where('d.level', query.level)
      if (query.kind) b.where('d.kind', query.kind)
      if (query.sort === 'title') b.orderBy([{ column: 'd.title' }, { column: 'd.id' }])
      else b.orderBy([{ column: 'd.updated_at', order: 'desc' }, { column: 'd.id', order: 'desc' }])
    })
  if (user.role !== 'teacher') {
    const rows: SummaryRow[] = await filtered(db('drills as d').whereIn('d.id', visibleDrillIds(db, user)).whereNull('d.archived_at'))
    return { drills: rows.map(toDrillSummary), shared: [] }
  }
  const [own, shared] = await Promise.all([
    filtered(db('drills as d').where('d.owner_id', user.id).modify(b => (query.archived ? b.whereNotNull('d.archived_at') : b.whereNull('d.archived_at')))),
    query.archived ? Promise.resolve([] as SummaryRow[]) : filtered(db('drills as d').where('d.is_public', true).whereNot('d.owner_id', user.id).whereNull('d.archived_at')),
  ]) as [SummaryRow[], SummaryRow[]]
  return { drills: own.map(toDrillSummary), shared: shared.map(toDrillSummary) }
}

const notFound = (): Error => createError({ statusCode: 404, statusMessage: 'Not found', message: 'Drill not found' })

/** A drill the user may open (their own, a public one, or one assigned to them); 404 otherwise. */
export async function visibleDrill(db: Knex, user: User, id: number): Promise<DrillRow> {
  const row: DrillRow | undefined = await db('drills').where('id', id).whereIn('id', visibleDrillIds(db, user)).first()
  if (!row) throw notFound()
  return row
}

/** A drill the teacher may change: 404 when they cannot see it, 403 when it is another teacher's public drill. */
export async function ownDrill(db: Knex, user: User, id: number): Promise<DrillRow> {
  const row = await visibleDrill(db, user, id)
  if (Number(row.owner_id) !== user.id) {
    throw createError({ statusCode: 403, statusMessage: 'Forbidden', message: 'This drill belongs to another teacher: duplicate it to make a copy of your own' })
  }
  return row
}

/** Notes from the typed notation, or a 400 that points at the line and column. */
function notesFromNotation(notation: string, hand: DrillHand, meter: string): DrillNote[] {
  const { beats, beatType } = parseMeter(meter)
  let notes: DrillNote[]
  try {
    notes = parseNotation(notation, { hand, beatsPerBar: (beats * 4) / beatType })
  }
  catch (error) {
    if (!(error instanceof NotationError)) throw error
    throw createError({ statusCode: 400, statusMessage: 'Invalid input', message: `notation: ${error.message}`, data: { issues: [{ path: 'notation', message: error.message, line: error.line, column: error.column }] } })
  }
  if (notes.length === 0) throw createError({ statusCode: 400, statusMessage: 'Invalid input', message: 'notation: There are no notes: type at least one, such as C4/1' })
  if (notes.length > 5000) throw createError({ statusCode: 400, statusMessage: 'Invalid input', message: 'notation: A drill has at most 5000 notes' })
  return notes
}

const sameMusic = (row: DrillRow, hand: DrillHand, tempoBpm: number, notes: DrillNote[]): boolean =>
  row.hand === hand && row.tempo_bpm === tempoBpm && JSON.stringify(parseJson(row.notes)) === JSON.stringify(notes)

export async function createDrill(db: Knex, user: User, input: DrillInput): Promise<DrillDetail> {
  const meter = input.meter ?? '4/4'
  const notes = input.notes ?? notesFromNotation(input.notation!, input.hand, meter)
  const id = await db.transaction(async (trx) => {
    const [id] = await trx('drills').insert({
      owner_id: user.id, title: input.title, description: input.description ?? null, kind: input.kind ?? 'other', hand: input.hand,
      key_signature: input.key ?? null, meter, tempo_bpm: input.tempoBpm, notes: JSON.stringify(notes),
      source: input.source ?? 'typed', version: 1, is_public: false, level: input.level ?? null, tags: JSON.stringify(input.tags ?? []),
    })
    await trx('drill_versions').insert({ drill_id: id, version: 1, hand: input.hand, tempo_bpm: input.tempoBpm, notes: JSON.stringify(notes) })
    return id!
  })
  return toDrillDetail(await db('drills').where('id', id).first())
}

/**
 * Changes a drill. New music on a version that students have already played becomes a new version,
 * so their attempts stay graded and shown against the notes they played; a version nobody has
 * played yet is corrected in place.
 */
export async function updateDrill(db: Knex, user: User, id: number, patch: DrillPatch): Promise<DrillDetail> {
  await db.transaction(async (trx) => {
    const row: DrillRow | undefined = await trx('drills').where('id', id).forUpdate().first()
    if (!row) throw notFound()
    if (patch.updatedAt && new Date(patch.updatedAt).getTime() !== new Date(row.updated_at).getTime()) {
      throw createError({ statusCode: 409, statusMessage: 'Conflict', message: 'This drill was changed elsewhere since you opened it: reload it and make your change again' })
    }
    const hand = patch.hand ?? row.hand
    const meter = patch.meter ?? row.meter
    const tempoBpm = patch.tempoBpm ?? row.tempo_bpm
    const notes = patch.notes ?? (patch.notation !== undefined ? notesFromNotation(patch.notation, hand, meter) : parseJson<DrillNote[]>(row.notes))
    let version = row.version
    if (!sameMusic(row, hand, tempoBpm, notes)) {
      const played = await trx('attempts').where({ drill_id: id, drill_version: row.version }).first('id')
      const music = { hand, tempo_bpm: tempoBpm, notes: JSON.stringify(notes) }
      if (played) {
        version = row.version + 1
        await trx('drill_versions').insert({ drill_id: id, version, ...music })
      }
      else {
        await trx('drill_versions').where({ drill_id: id, version }).update({ ...music, created_at: trx.fn.now(3) })
      }
    }
    await trx('drills').where('id', id).update({
      title: patch.title ?? row.title,
      description: patch.description === undefined ? row.description : patch.description,
      kind: patch.kind ?? row.kind,
      key_signature: patch.key === undefined ? row.key_signature : patch.key,
      level: patch.level === undefined ? row.level : patch.level,
      tags: JSON.stringify(patch.tags ?? parseJson<string[] | null>(row.tags) ?? []),
      source: patch.source ?? row.source,
      hand, meter, tempo_bpm: tempoBpm, notes: JSON.stringify(notes), version, updated_at: trx.fn.now(3),
    })
  })
  return toDrillDetail(await db('drills').where('id', id).first())
}

export async function duplicateDrill(db: Knex, user: User, source: DrillRow): Promise<DrillDetail> {
  const copy = toDrillDetail(source)
  return createDrill(db, user, {
    title: `${copy.title.slice(0, 152)} (copy)`, hand: copy.hand, tempoBpm: copy.tempoBpm, meter: copy.meter, key: copy.key,
    level: copy.level, kind: copy.kind as DrillInput['kind'], tags: copy.tags, description: copy.description,
    source: copy.source as DrillInput['source'], notes: copy.notes,
  }).then(async (drill) => {
    await db('drills').where('id', drill.id).update({ copied_from_id: copy.id })
    return { ...drill, copiedFromId: copy.id }
  })
}

/** Archives (true) or restores (false) a drill; 409 when it already is as asked. */
export async function setArchived(db: Knex, row: DrillRow, archived: boolean): Promise<DrillDetail> {
  const isArchived = row.archived_at !== null
  if (isArchived === archived) {
    throw createError({ statusCode: 409, statusMessage: 'Conflict', message: archived ? 'This drill is already archived' : 'This drill is not archived' })
  }
  await db('drills').where('id', row.id).update({ archived_at: archived ? db.fn.now(3) : null, updated_at: db.fn.now(3) })
  return toDrillDetail(await db('drills').where('id', row.id).first())
}

export interface DrillVersionSummary {
  version: number
  createdAt: string
  hand: DrillHand
  tempoBpm: number
  noteCount: number
  attempts: number
}

export async function drillVersions(db: Knex, drillId: number): Promise<DrillVersionSummary[]> {
  const rows = await db('drill_versions as v')
    .where('v.drill_id', drillId)
    .select('v.version', 'v.created_at', 'v.hand', 'v.tempo_bpm', db.raw('JSON_LENGTH(v.notes) AS note_count'))
    .select(db('attempts as a').whereRaw('a.drill_id = v.drill_id AND a.drill_version = v.version').count('*').as('attempts'))
    .orderBy('v.version', 'desc')
  return rows.map((r: Record<string, unknown>) => ({
    version: Number(r.version), createdAt: new Date(r.created_at as string).toISOString(), hand: r.hand as DrillHand,
    tempoBpm: Number(r.tempo_bpm), noteCount: Number(r.note_count), attempts: Number(r.attempts),
  }))
}

/** A file name from a drill's title, for the export's Content-Disposition. */
export function exportFileName(title: string, extension: string): string {
  const base = title.normalize('NFKD').replace(/[^\w\s-]/g, '').trim().replace(/\s+/g, '-').toLowerCase().slice(0, 80) || 'drill'
  return `${base}.${extension}`
}

/** A drill file read into a preview, or a 400 that names the file's problem. */
export function previewDrillFile(bytes: Uint8Array, options: DrillFileOptions): DrillFilePreview {
  try {
    return importDrillFile(bytes, { ...options, now: () => performance.now() })
  }
  catch (error) {
    // Whatever a hostile or broken file makes a reader throw is the file's fault, never a 500.
    const message = error instanceof ImportError ? error.message : `the file could not be read (${error instanceof Error ? error.message : String(error)})`
    throw createError({ statusCode: 400, statusMessage: 'Invalid input', message: `file: ${message}` })
  }
}

const EXPORTS = {
  // audio/midi is the registered type of a Standard MIDI File; MusicXML 4.0 registers its own for uncompressed files.
  mid: { type: 'audio/midi', write: (d: DrillDetail) => Buffer.from(exportDrillSmf(d, d.title)) },
  musicxml: { type: 'application/vnd.recordare.musicxml+xml; charset=utf-8', write: (d: DrillDetail) => exportDrillMusicXml(d, { title: d.title, key: d.key, meter: d.meter }) },
} as const

/** A drill the user may open, as a file to download. */
export async function sendDrillExport(event: H3Event, format: keyof typeof EXPORTS): Promise<Buffer | string> {
  const user = await requireRole(event)
  const { id } = validParams(event, DrillIdParams)
  const drill = toDrillDetail(await visibleDrill(useDb(), user, id))
  setResponseHeaders(event, { 'content-type': EXPORTS[format].type, 'content-disposition': `attachment; filename="${exportFileName(drill.title, format)}"` })
  return EXPORTS[format].write(drill)
}
