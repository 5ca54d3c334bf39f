import { spawnSync } from 'node:child_process'
import { fileURLToPath } from 'node:url'
import { describe, expect, it } from 'vitest'

const root = fileURLToPath(new URL('../../../', import.meta.url))

/** Runs the command line as `npm run -s engine` does (tsx on scripts/engine.ts), without npm's start-up. */
function engine(command: string, input: string): { status: number | null, stdout: string, stderr: string } {
  const run = spawnSync(`${root}node_modules/.bin/tsx`, ['scripts/engine.ts', command], { cwd: root, input, encoding: 'utf8' })
  return { status: run.status, stdout: run.stdout, stderr: run.stderr }
}

// Each test starts the command line (tsx compiling the engine), which takes seconds on a busy machine.
describe('scripts/engine.ts', { timeout: 30_000 }, () => {
  it('runs through the npm script, printing JSON only', () => {
    const run = spawnSync('npm', ['run', '-s', 'engine', '--', 'suggest'], { cwd: root, input: '{"hand":"left","notes":["C3","B2","A2"]}', encoding: 'utf8' })
    expect(run.status).toBe(0)
    expect(JSON.parse(run.stdout).fingers).toHaveLength(3)
  })

  it('suggest: fingers a C-major line given as names, numbers and a chord', () => {
    const run = engine('suggest', JSON.stringify({ hand: 'right', notes: ['C4', 'D4', 64, ['C4', 'E4', 'G4']], handSize: 'small' }))
    expect(run.status).toBe(0)
    const out = JSON.parse(run.stdout)
    expect(Object.keys(out).sort()).toEqual(['cost', 'fingers', 'positionChanges', 'positions'])
    expect(out.fingers).toHaveLength(4)
    expect(out.fingers[3]).toHaveLength(3)
    expect(out.positionChanges).toBe(out.positions.length)
  })

  it('suggest: takes a note with its emphasis as an object beside plain names', () => {
    // Right hand G4 down to A3 with a soft D4: the thumb leaves D4 (see emphasis.test.ts).
    const notes = ['G4', 'F4', 'E4', { pitch: 'D4', emphasis: 'soft' }, 'C4', 'B3', 'A3']
    const run = engine('suggest', JSON.stringify({ hand: 'right', notes }))
    expect(run.status).toBe(0)
    expect(JSON.parse(run.stdout).fingers[3]).not.toBe(1)
  })

  it('suggest with both hands: a hand and a finger for every note', () => {
    const run = engine('suggest', JSON.stringify({ hand: 'both', notes: ['C4', 'C6', 'C4', 'C6', ['C3', 'E3', 'G3', 'C5', 'E5']] }))
    expect(run.status).toBe(0)
    const out = JSON.parse(run.stdout)
    expect(Object.keys(out).sort()).toEqual(['cost', 'fingers', 'hands', 'positionChanges', 'positions'])
    expect(out.hands).toEqual(['left', 'right', 'left', 'right', ['left', 'left', 'left', 'right', 'right']])
    expect(out.fingers[4]).toHaveLength(5)
    expect(out.positionChanges).toBe(out.positions.length)
  })

  it('grade: returns the GradeResult for a drill and its events', () => {
    const drill = {
      hand: 'right',
      tempoBpm: 100,
      notes: ['C4', 'D4', 'E4', 'F4'].map((pitch, k) => ({ pitch, beat: k / 2, length: 0.5, finger: [1, 2, 3, 4][k] })),
    }
    const events = [60, 62, 64, 66].flatMap((note, k) => [
      { note, on: true, velocity: 64, timeMs: k * 300 },
      { note, on: false, timeMs: k * 300 + 250 },
    ])
    const run = engine('grade', JSON.stringify({ drill, events }))
    expect(run.status).toBe(0)
    const out = JSON.parse(run.stdout)
    expect(out.accuracy).toEqual({ correct: 3, wrong: 1, extra: 0, missed: 0, total: 4 })
    expect(out.timing.sdMs).toBeCloseTo(0, 6)
    expect(out.tempo).toEqual({ targetBpm: 100, playedBpm: 100 })
    expect(out.inferredFingers).toHaveLength(4)
    expect(typeof out.score).toBe('number')
    expect(out.positionChanges).toHaveProperty('at')
    expect(out.loudness).toHaveProperty('byFinger')
  })

  it('check: names each awkward spot of a fingering with its note index', () => {
    // Common practice: C D E F G sits in one position (1 2 3 4 5), and 4 and 5 should not alternate.
    const run = engine('check', JSON.stringify({ hand: 'right', notes: ['C4', 'D4', 'E4', 'F4', 'G4', 'F4', 'G4', 'F4'], fingers: [1, 2, 3, 1, 5, 4, 5, 4] }))
    expect(run.status).toBe(0)
    const out = JSON.parse(run.stdout)
    expect(Object.keys(out)).toEqual(['issues'])
    expect(out.issues[0]).toMatchObject({ index: 3, rule: 'avoidablePositionChange' })
    expect(out.issues[0].message).toMatch(/F4/)
    expect(out.issues).toContainEqual(expect.objectContaining({ index: 7, rule: 'fourFiveAlternation' }))
    const fine = engine('check', JSON.stringify({ hand: 'left', notes: ['C3', 'D3', 'E3', 'F3', 'G3'], fingers: [5, 4, 3, 2, 1] }))
    expect(JSON.parse(fine.stdout)).toEqual({ issues: [] })
  })

  it.each([
    ['check', '{"hand":"right","notes":["C4","D4"],"fingers":[1]}', /one entry per note/],
    ['suggest', '{"hand":"right","notes":[{"pitch":"C4","emphasis":"loud"}]}', /notes\[0\]/],
    ['check', '{"hand":"right","notes":["C4"],"fingers":[6]}', /fingers/],
    ['suggest', 'not json', /not JSON/],
    ['suggest', '{"hand":"middle","notes":["C4"]}', /hand/],
    ['suggest', '{"hand":"right","notes":["H4"]}', /"H4" is not a pitch[\s\S]*notes\[0\]/],
    ['grade', '{"drill":{"hand":"right","tempoBpm":100,"notes":[]},"events":[]}', /notes/],
    ['grade', '{"drill":{"hand":"right","tempoBpm":100,"notes":[{"pitch":"G#9","beat":0,"length":1}]},"events":[]}', /MIDI range/],
    ['transpose', '{}', /Usage/],
  ])('%s exits 2 with a message for bad input %j', (command, input, message) => {
    const run = engine(command, input)
    expect(run.status).toBe(2)
    expect(run.stdout).toBe('')
    expect(run.stderr).toMatch(message)
  })
})
