// The engine on the command line: `npm run -s engine -- suggest|grade|check` reads one JSON document
// on standard input and writes one on standard output, for scripts, benchmarks and checks.
// Bad input exits with 2 and a message on standard error; stdout then stays empty.
import { z } from 'zod'
import { checkFingering, gradeAttempt, PitchError, suggestFingering, suggestHands, toMidi } from '../shared/engine'
import { PlayedEvent } from '../shared/types/attempt'
import { DrillHand, DrillMusic, Emphasis, Finger, Hand, HandSize } from '../shared/types/drill'
import { TEMPO_LIMITS } from '../shared/utils/tempo'

const PitchValue = z.union([z.number(), z.string()])

// Names and numbers are checked in one place after the shape, so the message says what is wrong
// with this pitch (PitchError's wording) rather than that no union branch matched.
const PitchOrChord = z.union([PitchValue, z.array(PitchValue).min(1).max(10)])

// A note is a pitch (or a chord's pitches), or an object that also says how it is meant to sound:
// {"pitch": "F4", "emphasis": "soft"}.
const LineItemInput = z.union([PitchOrChord, z.object({ pitch: PitchOrChord, emphasis: Emphasis.optional() })]).transform((value, ctx) => {
  const pitch = typeof value === 'object' && !Array.isArray(value) ? value.pitch : value
  const emphasis = typeof value === 'object' && !Array.isArray(value) ? value.emphasis ?? null : null
  try {
    return { item: Array.isArray(pitch) ? pitch.map(toMidi) : toMidi(pitch), emphasis }
  }
  catch (error) {
    ctx.addIssue({ code: 'custom', message: error instanceof Error ? error.message : String(error) })
    return z.NEVER
  }
})

/** The engine's line and its emphases from the request's notes. */
function lineOf(notes: z.output<typeof LineItemInput>[]): { notes: (number | number[])[], emphasis: (Emphasis | null)[] } {
  return { notes: notes.map(n => n.item), emphasis: notes.map(n => n.emphasis) }
}

const SuggestRequest = z.object({
  // "both": a hand for every note as well as its finger (suggestHands).
  hand: DrillHand,
  notes: z.array(LineItemInput).min(1).max(5000),
  handSize: HandSize.optional(),
})

const CheckRequest = z.object({
  hand: Hand,
  notes: z.array(LineItemInput).min(1).max(5000),
  /** One per note: a finger, an array (low to high) for a chord, or null where left open. */
  fingers: z.array(z.union([Finger, z.array(Finger).min(1).max(10)]).nullable()).max(5000),
  handSize: HandSize.optional(),
  legato: z.boolean().optional(),
}).refine(r => r.fingers.length === r.notes.length, { message: 'fingers: give one entry per note (null where the finger is left open)', path: ['fingers'] })

const GradeRequest = z.object({
  drill: DrillMusic,
  // Wider than a saved attempt's limit, so benchmarks and checks can feed long runs.
  events: z.array(PlayedEvent).max(1_000_000),
  options: z.object({
    targetBpm: z.number().min(TEMPO_LIMITS.min).max(TEMPO_LIMITS.max).optional(),
    handSize: HandSize.optional(),
  }).optional(),
})

class InputError extends Error {}

function validate<T extends z.ZodType>(schema: T, data: unknown): z.output<T> {
  const result = schema.safeParse(data)
  if (!result.success) throw new InputError(z.prettifyError(result.error))
  return result.data
}

function run(command: string | undefined, input: string): unknown {
  if (command !== 'suggest' && command !== 'grade' && command !== 'check') {
    throw new InputError(`Usage: npm run -s engine -- suggest|grade|check < input.json (got ${command === undefined ? 'no command' : `"${command}"`})`)
  }
  let data: unknown
  try {
    data = JSON.parse(input)
  }
  catch (error) {
    throw new InputError(`Standard input is not JSON: ${error instanceof Error ? error.message : String(error)}`)
  }
  if (command === 'suggest') {
    const { hand, notes, handSize } = validate(SuggestRequest, data)
    const request = { ...lineOf(notes), handSize }
    if (hand === 'both') {
      const result = suggestHands(request)
      return { hands: result.hands, fingers: result.fingers, positionChanges: result.positionChanges, positions: result.positions, cost: result.cost }
    }
    const result = suggestFingering({ hand, ...request })
    return { fingers: result.fingers, positionChanges: result.positionChanges, positions: result.positions, cost: result.cost }
  }
  if (command === 'check') {
    const { notes, ...request } = validate(CheckRequest, data)
    return { issues: checkFingering({ ...request, ...lineOf(notes) }) }
  }
  const request = validate(GradeRequest, data)
  return gradeAttempt(request.drill, request.events, request.options)
}

async function readStdin(): Promise<string> {
  const chunks: Buffer[] = []
  for await (const chunk of process.stdin) chunks.push(chunk as Buffer)
  return Buffer.concat(chunks).toString('utf8')
}

try {
  const output = run(process.argv[2], await readStdin())
  process.stdout.write(`${JSON.stringify(output)}\n`)
}
catch (error) {
  // A drill's pitch that the schema's shape accepts but the MIDI range does not (G#9) is bad input too.
  if (error instanceof InputError || error instanceof PitchError) {
    process.stderr.write(`${error.message}\n`)
    process.exitCode = 2
  }
  else {
    throw error
  }
}
