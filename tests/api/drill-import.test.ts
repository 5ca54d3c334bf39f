import { randomUUID } from 'node:crypto'
import { strToU8, zipSync } from 'fflate'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { Client, closeTestDb, testDb } from '../support/server'
import { EVENING_STUDY, EVENING_STUDY_LEFT, EVENING_STUDY_RIGHT, FLUTE_AND_EMPTY_PIANO, eveningStudyMxl, twoHandsMidi } from '../fixtures/drill-files'

afterAll(closeTestDb)

interface Note { pitch: string, beat: number, length: number, finger?: number, hand?: string }
interface Preview {
  format: string
  drill: { hand: string, tempoBpm: number, key: string | null, meter: string | null, title: string | null, notes: Note[] }
  parts?: { number: number, name: string, staves: number, measures: number }[]
  tracks?: { number: number, name: string, noteCount: number }[]
}
interface ErrorBody { message: string }

const cells = (notes: Note[]): unknown[] => notes.map(n => [n.pitch, n.beat, n.length, n.finger ?? null])
const withoutFinger = (rows: (string | number)[][]): unknown[] => rows.map(([p, b, l, f]) => [p, b, l, f ?? null])

let teacher: Client
beforeAll(async () => {
  teacher = new Client()
  await teacher.post('/api/auth/register', { name: 'Importer', email: `i-${randomUUID()}@example.org`, password: 'a long test password' })
})

describe('POST /api/drills/import, MusicXML', () => {
  it('reads a hand-written grand staff: chords, rests, ties, backup, forward and fingering', async () => {
    const res = await teacher.upload<Preview>('/api/drills/import', { name: 'evening.musicxml', bytes: EVENING_STUDY })
    expect(res.status).toBe(200)
    expect(res.body.format).toBe('musicxml')
    expect(res.body.drill).toMatchObject({ hand: 'both', tempoBpm: 92, key: 'G major', meter: '3/4', title: 'Evening study' })
    expect(cells(res.body.drill.notes.filter(n => n.hand === 'right'))).toEqual(EVENING_STUDY_RIGHT)
    expect(cells(res.body.drill.notes.filter(n => n.hand === 'left'))).toEqual(EVENING_STUDY_LEFT)
    expect(res.body.parts).toEqual([{ number: 1, id: 'P1', name: 'Piano', staves: 2, measures: 2 }])
  })

  it('reads the same score zipped as .mxl, found through META-INF/container.xml', async () => {
    const res = await teacher.upload<Preview>('/api/drills/import', { name: 'evening.mxl', bytes: eveningStudyMxl() })
    expect(res.status).toBe(200)
    expect(res.body.format).toBe('mxl')
    expect(cells(res.body.drill.notes.filter(n => n.hand === 'right'))).toEqual(EVENING_STUDY_RIGHT)
  })

  it('tells the type by content, not by the name', async () => {
    const res = await teacher.upload<Preview>('/api/drills/import', { name: 'evening.mid', bytes: EVENING_STUDY })
    expect(res.status).toBe(200)
    expect(res.body.format).toBe('musicxml')
  })

  it('takes one staff, as the hand the teacher chooses', async () => {
    const res = await teacher.upload<Preview>('/api/drills/import', { name: 'evening.musicxml', bytes: EVENING_STUDY }, { staff: '2' })
    expect(res.status).toBe(200)
    expect(res.body.drill.hand).toBe('left')
    expect(cells(res.body.drill.notes)).toEqual(EVENING_STUDY_LEFT)
    expect(res.body.drill.notes.every(n => n.hand === undefined)).toBe(true)
  })

  it('takes a measure range, counting beats from its first measure', async () => {
    const res = await teacher.upload<Preview>('/api/drills/import', { name: 'evening.musicxml', bytes: EVENING_STUDY }, { measures: '2-2', staff: '1' })
    expect(res.status).toBe(200)
    // The tie's start lies outside the range, so its second half stands as a note of its own, unfingered.
    expect(cells(res.body.drill.notes)).toEqual(withoutFinger([['C5', 0, 1], ['B4', 1, 1, 2], ['A4', 2, 1, 1]]))
  })

  it('chooses a part, and says so when that part has no notes', async () => {
    const flute = await teacher.upload<Preview>('/api/drills/import', { name: 'duo.xml', bytes: FLUTE_AND_EMPTY_PIANO }, { part: '1' })
    expect(cells(flute.body.drill.notes)).toEqual(withoutFinger([['E5', 0, 1], ['F5', 1, 1], ['G5', 2, 2]]))
    expect(flute.body.parts?.map(p => p.name)).toEqual(['Flute', 'Piano'])
    const piano = await teacher.upload<ErrorBody>('/api/drills/import', { name: 'duo.xml', bytes: FLUTE_AND_EMPTY_PIANO }, { part: '2' })
    expect(piano.status).toBe(400)
    expect(piano.body.message).toContain('no notes in part 2')
    const third = await teacher.upload<ErrorBody>('/api/drills/import', { name: 'duo.xml', bytes: FLUTE_AND_EMPTY_PIANO }, { part: '3' })
    expect(third.status).toBe(400)
    expect(third.body.message).toMatch(/part 3 does not exist/i)
  })

  it('refuses a timewise score', async () => {
    const res = await teacher.upload<ErrorBody>('/api/drills/import', { name: 'tw.musicxml', bytes: '<?xml version="1.0"?><score-timewise version="4.0"><part-list/></score-timewise>' })
    expect(res.status).toBe(400)
    expect(res.body.message).toContain('score-timewise is not supported')
  })
})

describe('POST /api/drills/import, Standard MIDI Files', () => {
  it('reads a file written by midi-writer-js: two tracks become both hands, with tempo and metre', async () => {
    const res = await teacher.upload<Preview>('/api/drills/import', { name: 'hands.mid', bytes: twoHandsMidi() })
    expect(res.status).toBe(200)
    expect(res.body.format).toBe('midi')
    expect(res.body.drill).toMatchObject({ hand: 'both', tempoBpm: 100, meter: '3/4' })
    expect(res.body.tracks?.map(t => [t.number, t.name, t.noteCount])).toEqual([[1, 'Right hand', 3], [2, 'Left hand', 2]])
    const right = res.body.drill.notes.filter(n => n.hand === 'right').map(n => [n.pitch, n.beat, n.length])
    const left = res.body.drill.notes.filter(n => n.hand === 'left').map(n => [n.pitch, n.beat, n.length])
    expect(right).toEqual([['C5', 0, 1], ['E5', 1, 1], ['G5', 2, 1]])
    expect(left).toEqual([['C3', 0, 2], ['E3', 2, 1]])
  })

  it('reads one chosen track for the chosen hand', async () => {
    const res = await teacher.upload<Preview>('/api/drills/import', { name: 'hands.mid', bytes: twoHandsMidi() }, { track: '2', hand: 'left' })
    expect(res.status).toBe(200)
    expect(res.body.drill.hand).toBe('left')
    expect(res.body.drill.notes.map(n => n.pitch)).toEqual(['C3', 'E3'])
    const missing = await teacher.upload<ErrorBody>('/api/drills/import', { name: 'hands.mid', bytes: twoHandsMidi() }, { track: '7' })
    expect(missing.status).toBe(400)
    expect(missing.body.message).toMatch(/^file: track 7 does not exist/)
  })

  it('says "not a MIDI file" for a .mid that is something else', async () => {
    const res = await teacher.upload<ErrorBody>('/api/drills/import', { name: 'song.mid', bytes: 'RIFF....WAVEfmt ' })
    expect(res.status).toBe(400)
    expect(res.body.message).toContain('not a MIDI file')
  })
})

describe('POST /api/drills/import, hostile and broken uploads', () => {
  const u32 = (n: number): number[] => [(n >>> 24) & 255, (n >>> 16) & 255, (n >>> 8) & 255, n & 255]
  const bytes = (...parts: (string | number[])[]): Uint8Array => new Uint8Array(parts.flatMap(p => (typeof p === 'string' ? [...p].map(c => c.charCodeAt(0)) : p)))
  const lol = ['<?xml version="1.0"?>', '<!DOCTYPE lolz [', '<!ENTITY lol "lol">']
  for (let k = 1; k <= 9; k++) lol.push(`<!ENTITY lol${k} "${`&lol${k === 1 ? '' : k - 1};`.repeat(10)}">`)
  lol.push(']>', '<score-partwise version="4.0"><movement-title>&lol9;</movement-title></score-partwise>')
  const container = strToU8('<container><rootfiles><rootfile full-path="score.xml"/></rootfiles></container>')

  const cases: [string, () => { name: string, bytes: Uint8Array | string }, RegExp][] = [
    ['a truncated MIDI file', () => ({ name: 'cut.mid', bytes: twoHandsMidi().subarray(0, 40) }), /^file: this MIDI file is (truncated|damaged)/],
    // SMF 1.0: the header's track count is 16 bits, so the most a header can promise is 65,535 tracks; the
    // one track chunk also claims 10^9 bytes.
    ['a MIDI file claiming 65,535 tracks of 10^9 bytes', () => ({ name: 'many.mid', bytes: bytes('MThd', u32(6), [0, 1, 255, 255, 0, 96], 'MTrk', u32(1_000_000_000), [0, 0x90, 60, 64]) }), /^file: this MIDI file is (truncated|damaged)/],
    ['a MIDI header claiming 10^9 bytes', () => ({ name: 'head.mid', bytes: bytes('MThd', u32(1_000_000_000), [0, 1, 0, 1, 0, 96]) }), /^file: this MIDI file is damaged/],
    ['XML with an external entity', () => ({ name: 'xxe.musicxml', bytes: '<?xml version="1.0"?><!DOCTYPE score-partwise [<!ENTITY xxe SYSTEM "file:///etc/passwd">]><score-partwise version="4.0"><movement-title>&xxe;</movement-title></score-partwise>' }), /^file: .*entities/],
    ['XML with a billion-laughs expansion', () => ({ name: 'lol.xml', bytes: lol.join('\n') }), /^file: .*entities/],
    ['a zip bomb', () => ({ name: 'bomb.mxl', bytes: zipSync({ 'META-INF/container.xml': container, 'score.xml': new Uint8Array(64 * 1024 * 1024).fill(32) }, { level: 9 }) }), /^file: the \.mxl archive unpacks to more than 16 MB/],
    ['a 3 MB file', () => ({ name: 'big.mid', bytes: new Uint8Array(3 * 1024 * 1024).fill(65) }), /^file: the file is over 2 MB$/],
    ['an empty file', () => ({ name: 'empty.mid', bytes: new Uint8Array(0) }), /^file: the file is empty$/],
    ['a damaged .mxl', () => ({ name: 'broken.mxl', bytes: eveningStudyMxl().subarray(0, 200) }), /^file: the \.mxl archive/],
  ]

  it.each(cases)('answers %s with a 400 that says why, and stores nothing', async (_, make, message) => {
    const db = testDb()
    const count = async (): Promise<number> => Number((await db('drills').count('* as n'))[0]!.n) + Number((await db('drill_versions').count('* as n'))[0]!.n)
    const before = await count()
    const res = await teacher.upload<ErrorBody>('/api/drills/import', make())
    expect(res.status).toBe(400)
    expect(res.body.message).toMatch(message)
    expect(await count()).toBe(before)
  })

  it('refuses a request without a file, and a field that is not valid', async () => {
    const none = await teacher.upload<ErrorBody>('/api/drills/import', null, { part: '1' })
    expect(none.status).toBe(400)
    expect(none.body.message).toMatch(/^file:/)
    const bad = await teacher.upload<ErrorBody>('/api/drills/import', { name: 'e.musicxml', bytes: EVENING_STUDY }, { staff: '3' })
    expect(bad.status).toBe(400)
    expect(bad.body.message).toMatch(/^staff:/)
    const json = await teacher.post<ErrorBody>('/api/drills/import', { file: 'x' })
    expect(json.status).toBe(400)
  })

  it('is for teachers only', async () => {
    expect((await new Client().upload('/api/drills/import', { name: 'e.musicxml', bytes: EVENING_STUDY })).status).toBe(401)
    const student = await new Client().signIn('theo@evenhand.test')
    expect((await student.upload('/api/drills/import', { name: 'e.musicxml', bytes: EVENING_STUDY })).status).toBe(403)
  })
})
