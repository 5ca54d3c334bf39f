// An uploaded drill file, told apart by its content rather than its name: a Standard MIDI File
// begins with `MThd` (SMF 1.0), a compressed MusicXML file (.mxl) is a zip archive (`PK\x03\x04`,
// the ZIP local file header) whose META-INF/container.xml names the score, and anything else must
// be XML whose root is <score-partwise>. Every limit that keeps a hostile file from costing the
// server lives here: the size of what was sent, the unpacked size of an archive, the time spent.
import { Unzip, UnzipInflate, strFromU8 } from 'fflate'
import { XMLParser } from 'fast-xml-parser'
import { ImportError } from './importing'
import { importMusicXml, musicXmlParts, parseMusicXml, type MusicXmlImportOptions, type MusicXmlPart } from './musicxml'
import { importSmf, parseSmf, smfTracks, type SmfTrack } from './smf'
import type { Hand, ImportedDrill } from './types'

export const UPLOAD_LIMITS = {
  /** The largest file accepted, counted on the bytes received. */
  bytes: 2 * 1024 * 1024,
  /** The most an .mxl archive may unpack to, all entries read together (a zip bomb stops here). */
  unpackedBytes: 16 * 1024 * 1024,
  /** The longest an import may take before it is abandoned. */
  timeMs: 2000,
} as const

export type DrillFileFormat = 'midi' | 'musicxml' | 'mxl'

export interface DrillFileOptions {
  hand?: Hand
  /** MusicXML: the part, from 1. */
  part?: number
  /** MusicXML: one staff or both. */
  staff?: MusicXmlImportOptions['staff']
  /** MusicXML: the measures to read, from 1, both ends included. */
  measures?: { from: number, to: number }
  /** MIDI: the tracks to read, from 1 among those with notes. */
  tracks?: number[]
  /** The file's name, only to word a message for what the teacher meant to send. */
  fileName?: string
  /** Milliseconds since an arbitrary origin; the import stops when it has run `UPLOAD_LIMITS.timeMs`. */
  now?: () => number
}

export interface DrillFilePreview {
  format: DrillFileFormat
  drill: ImportedDrill
  /** MusicXML: the parts to choose from. */
  parts?: MusicXmlPart[]
  /** MIDI: the tracks with notes to choose from. */
  tracks?: SmfTrack[]
}

const startsWith = (bytes: Uint8Array, text: string): boolean => [...text].every((c, k) => bytes[k] === c.charCodeAt(0))

/** Only the entries an .mxl reader needs are inflated, and all of them together stop at the cap. */
function unpackMxl(bytes: Uint8Array): Map<string, Uint8Array> {
  const files = new Map<string, Uint8Array>()
  let total = 0
  let failure: ImportError | null = null
  const unzip = new Unzip((file) => {
    const wanted = file.name === 'META-INF/container.xml' || (!file.name.startsWith('META-INF/') && /\.(?:xml|musicxml)$/i.test(file.name))
    if (!wanted || failure) return
    const chunks: Uint8Array[] = []
    file.ondata = (error, data, final) => {
      if (failure) return
      if (error) {
        failure = new ImportError(`the .mxl archive is damaged (${error.message})`)
        return
      }
      total += data.length
      if (total > UPLOAD_LIMITS.unpackedBytes) {
        failure = new ImportError(`the .mxl archive unpacks to more than ${UPLOAD_LIMITS.unpackedBytes / 1024 / 1024} MB, which is not accepted`)
        file.terminate()
        return
      }
      chunks.push(data)
      if (final) {
        const joined = new Uint8Array(chunks.reduce((s, c) => s + c.length, 0))
        let at = 0
        for (const c of chunks) {
          joined.set(c, at)
          at += c.length
        }
        files.set(file.name, joined)
      }
    }
    file.start()
  })
  unzip.register(UnzipInflate)
  try {
    unzip.push(bytes, true)
  }
  catch (error) {
    failure ??= new ImportError(`the .mxl archive is damaged (${error instanceof Error ? error.message : String(error)})`)
  }
  if (failure) throw failure
  return files
}

/** The score an .mxl names in META-INF/container.xml (MusicXML 4.0, "Compressed MusicXML files"). */
function scoreOfMxl(bytes: Uint8Array): string {
  const files = unpackMxl(bytes)
  const container = files.get('META-INF/container.xml')
  let path: string | undefined
  if (container) {
    const text = strFromU8(container)
    if (/<!ENTITY/i.test(text)) throw new ImportError('the .mxl container declares XML entities, which are not accepted')
    const parsed = new XMLParser({ ignoreAttributes: false, attributeNamePrefix: '', processEntities: false }).parse(text) as Record<string, unknown>
    const rootfiles = (parsed.container as { rootfiles?: { rootfile?: unknown } } | undefined)?.rootfiles?.rootfile
    const first = (Array.isArray(rootfiles) ? rootfiles[0] : rootfiles) as { 'full-path'?: string } | undefined
    path = first?.['full-path']
  }
  path ??= [...files.keys()].find(name => !name.startsWith('META-INF/'))
  const score = path ? files.get(path) : undefined
  if (!score) throw new ImportError(`the .mxl archive does not hold the score its container names (${path ?? 'none named'})`)
  return strFromU8(score)
}

function describeMismatch(fileName: string | undefined): string {
  if (/\.midi?$/i.test(fileName ?? '')) return 'not a MIDI file: a Standard MIDI File begins with an MThd header'
  if (/\.(?:musicxml|xml)$/i.test(fileName ?? '')) return 'not a MusicXML file: its root element must be <score-partwise>'
  if (/\.mxl$/i.test(fileName ?? '')) return 'not a compressed MusicXML (.mxl) file: it is not a zip archive'
  return 'not a MIDI file, a MusicXML score or an .mxl archive'
}

/** Reads an uploaded file into a drill preview, or throws an ImportError that says what is wrong. */
export function importDrillFile(bytes: Uint8Array, options: DrillFileOptions = {}): DrillFilePreview {
  if (bytes.length === 0) throw new ImportError('the file is empty')
  if (bytes.length > UPLOAD_LIMITS.bytes) throw new ImportError(`the file is over ${UPLOAD_LIMITS.bytes / 1024 / 1024} MB`)
  const now = options.now ?? (() => 0)
  const started = now()
  const isLate = (): boolean => now() - started > UPLOAD_LIMITS.timeMs

  if (startsWith(bytes, 'MThd')) {
    const doc = parseSmf(bytes)
    return { format: 'midi', drill: importSmf(doc, { hand: options.hand, tracks: options.tracks }), tracks: smfTracks(doc) }
  }
  const zipped = startsWith(bytes, 'PK\u0003\u0004')
  let text: string
  if (zipped) {
    text = scoreOfMxl(bytes)
  }
  else {
    try {
      text = new TextDecoder('utf-8', { fatal: true }).decode(bytes)
    }
    catch {
      throw new ImportError(describeMismatch(options.fileName))
    }
    if (!/^\uFEFF?\s*</.test(text)) throw new ImportError(describeMismatch(options.fileName))
  }
  if (isLate()) throw new ImportError('reading the file took too long')
  const doc = parseMusicXml(text)
  const drill = importMusicXml(doc, { hand: options.hand, part: options.part, staff: options.staff, measures: options.measures, isLate })
  return { format: zipped ? 'mxl' : 'musicxml', drill, parts: musicXmlParts(doc) }
}
