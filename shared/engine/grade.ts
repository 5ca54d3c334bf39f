// Grading one attempt: pair the raw events into notes, align them with the drill, then measure
// accuracy, timing evenness, loudness evenness, hand-position changes and tempo, and weigh
// them into one score. The server re-runs this on every saved attempt, so it must accept any
// event list without throwing and stay cheap (a 1,000-note attempt in a few milliseconds).
//
// Score (also returned as `scoreFormula`, built from the constants below so the two cannot drift):
//   score = 100 × Σ weight × part, weights accuracy 0.35, timing 0.25, loudness 0.15, positions 0.10, tempo 0.15
//   accuracy  = correct / (drill notes + extra notes)
//   timing    = max(0, 1 − cvPercent / 20)           (cvPercent: onset SD as % of the note step)
//   loudness  = max(0, 1 − velocity SD / 20 − 0.25 × emphasis checks failed)
//               (SD among notes of equal emphasis; the checks: accents stand out, soft notes stay soft)
//   positions = max(0, 1 − |played − planned| / (planned + 1))
//   tempo     = min(played, target) / max(played, target)
//   Every part but accuracy is multiplied by the share of drill notes played (correct + wrong),
//   so three clean notes out of a hundred do not earn the timing and tempo marks. Where no note
//   carried a velocity (on-screen keys), loudness drops out and the other weights are rescaled.
import { alignmentSides, alignSides, type Alignment } from './align'
import { positionStarts } from './positions'
import { drillNoteHands } from './hands'
import { inferFingering, type PerformedNote } from './infer'
import { pairNoteEvents, type PlayedNote } from './performance'
import { midiFromName } from './pitch'
import { leastSquaresLine, mean, median, standardDeviation, type Line } from './stats'
import { suggestFingering } from './suggest'
import type { DrillMusic, Emphasis, Finger, GradeOptions, GradeResult, Hand, LineItem, PlayedEvent } from './types'

/** Stored with every attempt, so grades from an older engine can be told apart and recomputed. */
export const ENGINE_VERSION = '1.14.0'

type Part = keyof GradeResult['scoreParts']

const WEIGHTS: Record<Part, number> = { accuracy: 0.35, timing: 0.25, loudness: 0.15, positions: 0.1, tempo: 0.15 }
/** An onset SD this large a share of the note step earns no timing marks (a clearly audible unevenness, common practice). */
const TIMING_ZERO_CV_PERCENT = 20
/** A velocity SD this large earns no loudness marks (about one dynamic level, from memory). */
const LOUDNESS_ZERO_SD = 20
/**
 * How much louder an accent, or softer a soft note, must be than the ordinary notes, in MIDI velocity:
 * half of LOUDNESS_ZERO_SD's dynamic level (from memory, as that figure is).
 */
const EMPHASIS_MIN_VELOCITY = 10
/** Loudness marks lost for each emphasis check a performance fails (our own choice: a quarter). */
const EMPHASIS_CHECK_PENALTY = 0.25

/** The velocity handed to the inference for notes that carried none: the middle of the MIDI range. */
const NEUTRAL_VELOCITY = 64

export const SCORE_FORMULA = `score = 100 × (${WEIGHTS.accuracy}·accuracy + ${WEIGHTS.timing}·timing + ${WEIGHTS.loudness}·loudness + ${WEIGHTS.positions}·positions + ${WEIGHTS.tempo}·tempo); `
  + `accuracy = correct / (drill notes + extra); timing = max(0, 1 − cvPercent / ${TIMING_ZERO_CV_PERCENT}); `
  + `loudness = max(0, 1 − velocity SD among notes of equal emphasis / ${LOUDNESS_ZERO_SD} − ${EMPHASIS_CHECK_PENALTY} × failed emphasis checks `
  + `(accents at least ${EMPHASIS_MIN_VELOCITY} louder than ordinary notes, soft notes at least ${EMPHASIS_MIN_VELOCITY} softer)); positions = max(0, 1 − |played − planned| / (planned + 1)); `
  + `tempo = min(played, target) / max(played, target); every part but accuracy is multiplied by the share of drill notes played; `
  + `without any velocity, loudness drops out and the other weights are rescaled to sum 1`

interface Target {
  index: number
  midi: number
  beat: number
  hand: Hand
  finger: Finger | null
  emphasis: Emphasis | null
}

function targetsOf(drill: DrillMusic): Target[] {
  const hands = drillNoteHands(drill)
  return drill.notes.map((note, index) => {
    const midi = midiFromName(note.pitch)
    return { index, midi, beat: note.beat, hand: hands[index]!, finger: note.finger ?? null, emphasis: note.emphasis ?? null }
  })
}

/** Drill notes of one hand as a line: notes on one beat form a chord, low to high. */
function lineOf(targets: Target[]): Target[][] {
  const sorted = [...targets].sort((a, b) => a.beat - b.beat || a.midi - b.midi)
  const items: Target[][] = []
  for (const t of sorted) {
    const last = items[items.length - 1]
    if (last && last[0]!.beat === t.beat) last.push(t)
    else items.push([t])
  }
  return items
}

/** Where the planned fingering changes position; fingers the teacher left open come from the suggestion. */
function plannedPositionStarts(hand: Hand, targets: Target[], handSize: GradeOptions['handSize']): number[] {
  const items = lineOf(targets)
  if (items.length === 0) return []
  const line: LineItem[] = items.map(item => item.length === 1 ? item[0]!.midi : item.map(t => t.midi))
  const suggested = items.some(item => item.some(t => t.finger === null))
    ? suggestFingering({ hand, notes: line, handSize }).fingers
    : null
  const fingers = items.map((item, k): Finger | Finger[] => {
    const s = suggested?.[k]
    return item.length === 1 ? plannedFinger(item[0]!, s, 0) : item.map((t, member) => plannedFinger(t, s, member))
  })
  return positionStarts(hand, line, fingers, handSize).map(k => items[k]![0]!.index)
}

/** A drill note's planned finger: the teacher's, or else the suggestion's for its place in the item. */
function plannedFinger(t: Target, suggested: Finger | Finger[] | undefined, member: number): Finger {
  return t.finger ?? (Array.isArray(suggested) ? suggested[member]! : suggested!)
}

interface Inferred {
  fingers: GradeResult['inferredFingers']
  at: number[]
}

/** The inference over each hand's matched notes, mapped back to drill-note indices. */
function inferPerHand(targets: Target[], matched: (PlayedNote | null)[], handSize: GradeOptions['handSize']): Inferred {
  const fingers: (GradeResult['inferredFingers'][number] | undefined)[] = new Array(targets.length)
  const at: number[] = []
  for (const hand of ['right', 'left'] as const) {
    const mine = targets.filter(t => t.hand === hand && matched[t.index] !== null)
      .sort((a, b) => matched[a.index]!.onMs - matched[b.index]!.onMs || a.midi - b.midi)
    if (mine.length === 0) continue
    const notes: PerformedNote[] = mine.map((t) => {
      const p = matched[t.index]!
      return { midi: p.midi, onMs: p.onMs, offMs: p.offMs, velocity: p.velocity ?? NEUTRAL_VELOCITY, beat: t.beat }
    })
    const result = inferFingering(hand, notes, handSize)
    for (let k = 0; k < mine.length; k++) fingers[mine[k]!.index] = result.fingers[k]
    for (const k of result.positions) if (mine[k]) at.push(mine[k].index)
  }
  // Missed notes, and any the inference left without a finger, have none.
  for (let k = 0; k < fingers.length; k++) fingers[k] ??= { finger: null, confidence: 0 }
  return { fingers: fingers as GradeResult['inferredFingers'], at: at.sort((a, b) => a - b) }
}

interface Timing {
  timing: GradeResult['timing']
  msPerBeat: number | null
}

/** The drill's typical step: the median gap between consecutive distinct beats. */
function typicalStep(targets: Target[]): number | null {
  // Drills mostly list their notes in beat order already; otherwise a typed array sorts numerically
  // without a comparator call per comparison.
  const beats = new Float64Array(targets.length)
  let ascending = true
  for (let k = 0; k < targets.length; k++) {
    beats[k] = targets[k]!.beat
    if (k > 0 && beats[k]! < beats[k - 1]!) ascending = false
  }
  if (!ascending) beats.sort()
  const gaps: number[] = []
  for (let k = 1; k < beats.length; k++) if (beats[k] !== beats[k - 1]) gaps.push(beats[k]! - beats[k - 1]!)
  return median(gaps)
}

/** The shortest beat a played line can show, in ms. */
const MIN_MS_PER_BEAT = 1

/** Onsets against beats for the matched notes, and the straight line through them. */
function fitOnsets(targets: Target[], matched: (PlayedNote | null)[]): { xs: number[], ys: number[], line: Line | null } {
  const xs: number[] = []
  const ys: number[] = []
  for (const t of targets) {
    const p = matched[t.index]
    if (!p) continue
    xs.push(t.beat)
    ys.push(p.onMs)
  }
  const line = leastSquaresLine(xs, ys)
  // Below a millisecond per beat (60,000 bpm) no tempo was played: onsets a few denormal fractions of a
  // millisecond apart would otherwise give an infinite tempo and NaN figures.
  return { xs, ys, line: line && line.slope >= MIN_MS_PER_BEAT ? line : null }
}

/**
 * Pitch and order first; then again with the tempo that alignment implies, so that time
 * decides between equally good matches (a repeated key, a doubled note). Both passes read the
 * same sides, put in order once.
 */
function alignWithTime(targets: Target[], played: PlayedNote[], step: number | null): Alignment {
  const sides = alignmentSides(targets, played)
  const first = alignSides(sides)
  // Without a missed or an extra note there is nothing for time to settle.
  if (first.counts.missed === 0 && first.counts.extra === 0) return first
  const { line } = fitOnsets(targets, first.match.map(k => (k === null ? null : played[k]!)))
  if (!line || !step) return first
  return alignSides(sides, { msPerBeat: line.slope, toleranceMs: line.slope * step })
}

function measureTiming(targets: Target[], matched: (PlayedNote | null)[], step: number | null): Timing {
  const deviationsMs = new Array<number | null>(targets.length).fill(null)
  const { xs, ys, line } = fitOnsets(targets, matched)
  if (!line) return { timing: { sdMs: null, cvPercent: null, ioiVariationPercent: null, deviationsMs }, msPerBeat: null }
  const msPerBeat = line.slope
  const residuals: number[] = []
  for (const t of targets) {
    const p = matched[t.index]
    if (!p) continue
    const r = p.onMs - (line.intercept + line.slope * t.beat)
    deviationsMs[t.index] = r
    residuals.push(r)
  }
  const sdMs = standardDeviation(residuals)!
  const cvPercent = step ? (100 * sdMs) / (msPerBeat * step) : null
  return { timing: { sdMs, cvPercent, ioiVariationPercent: ioiVariation(xs, ys), deviationsMs }, msPerBeat }
}

/**
 * Local unevenness: the mean change between consecutive inter-onset intervals (each per beat,
 * chords taken at their mean onset) as a percentage of the mean interval. A steady drift in
 * tempo barely moves it; a limp on every other note does.
 */
function ioiVariation(beats: number[], onsets: number[]): number | null {
  // One point per beat, its onset the mean of the beat's notes (summed in the order they come).
  const pointBeats: number[] = []
  const pointOnsets: number[] = []
  const order = ascendingOrder(beats)
  for (let start = 0; start < order.length;) {
    const beat = beats[order[start]!]!
    let sum = 0
    let end = start
    for (; end < order.length && beats[order[end]!] === beat; end++) sum += onsets[order[end]!]!
    pointBeats.push(beat)
    pointOnsets.push(sum / (end - start))
    start = end
  }
  const iois: number[] = []
  for (let k = 1; k < pointBeats.length; k++) iois.push((pointOnsets[k]! - pointOnsets[k - 1]!) / (pointBeats[k]! - pointBeats[k - 1]!))
  if (iois.length < 2) return null
  const changes: number[] = []
  for (let k = 1; k < iois.length; k++) changes.push(Math.abs(iois[k]! - iois[k - 1]!))
  const meanIoi = mean(iois)!
  return meanIoi > 0 ? (100 * mean(changes)!) / meanIoi : null
}

/** Indices of `values` in ascending order, equal values in their own order; no sort when they already ascend. */
function ascendingOrder(values: readonly number[]): number[] {
  const order = values.map((_, k) => k)
  for (let k = 1; k < values.length; k++) {
    if (values[k]! < values[k - 1]!) return order.sort((a, b) => values[a]! - values[b]! || a - b)
  }
  return order
}

/** Velocities of the matched notes of each emphasis ('ordinary' for unmarked notes). */
function velocitiesByEmphasis(targets: Target[], velocities: (number | null)[]): Record<Emphasis | 'ordinary', number[]> {
  const groups: Record<Emphasis | 'ordinary', number[]> = { soft: [], ordinary: [], accent: [] }
  for (const t of targets) {
    const v = velocities[t.index]
    if (v != null) groups[t.emphasis ?? 'ordinary'].push(v)
  }
  return groups
}

/** Each velocity's distance from the mean of its own emphasis group, so that a planned accent is not unevenness. */
function pooledDeviation(groups: Record<Emphasis | 'ordinary', number[]>): number | null {
  const residuals: number[] = []
  for (const values of Object.values(groups)) {
    const m = mean(values)
    if (m !== null) for (const v of values) residuals.push(v - m)
  }
  return standardDeviation(residuals)
}

function emphasisChecks(groups: Record<Emphasis | 'ordinary', number[]>): GradeResult['loudness']['emphasis'] {
  const ordinary = mean(groups.ordinary)
  const accent = mean(groups.accent)
  const soft = mean(groups.soft)
  const accentLift = ordinary === null || accent === null ? null : accent - ordinary
  const softDrop = ordinary === null || soft === null ? null : ordinary - soft
  return {
    accentLift,
    softDrop,
    accentsStandOut: accentLift === null ? null : accentLift >= EMPHASIS_MIN_VELOCITY,
    softStaysSoft: softDrop === null ? null : softDrop >= EMPHASIS_MIN_VELOCITY,
  }
}

function measureLoudness(targets: Target[], matched: (PlayedNote | null)[], fingers: GradeResult['inferredFingers']): GradeResult['loudness'] {
  const velocities = targets.map(t => matched[t.index]?.velocity ?? null)
  const present = velocities.filter((v): v is number => v !== null)
  const overall = mean(present)
  const byFinger: GradeResult['loudness']['byFinger'] = { 1: null, 2: null, 3: null, 4: null, 5: null }
  if (overall !== null) {
    const sum = [0, 0, 0, 0, 0, 0]
    const count = [0, 0, 0, 0, 0, 0]
    for (const t of targets) {
      const finger = fingers[t.index]!.finger
      const v = velocities[t.index]
      if (finger === null || v == null) continue
      sum[finger]! += v
      count[finger]!++
    }
    for (const f of [1, 2, 3, 4, 5] as const) byFinger[f] = count[f] ? sum[f]! / count[f]! - overall : null
  }
  const measured = ([1, 2, 3, 4, 5] as const).filter(f => byFinger[f] !== null)
  // Loudest and softest mean something only between at least two fingers.
  const pick = (sign: 1 | -1): Finger | null => measured.length < 2
    ? null
    : measured.reduce((best, f) => sign * byFinger[f]! > sign * byFinger[best]! ? f : best)
  const groups = velocitiesByEmphasis(targets, velocities)
  return {
    sd: pooledDeviation(groups),
    mean: overall,
    byFinger,
    loudestFinger: pick(1),
    softestFinger: pick(-1),
    velocities,
    emphasis: emphasisChecks(groups),
  }
}

/** The loudness part: evenness among notes of equal emphasis, less a share for each emphasis check failed. */
function loudnessValue(loudness: GradeResult['loudness']): number {
  const { accentsStandOut, softStaysSoft } = loudness.emphasis
  const failed = (accentsStandOut === false ? 1 : 0) + (softStaysSoft === false ? 1 : 0)
  return clamp01(1 - loudness.sd! / LOUDNESS_ZERO_SD - EMPHASIS_CHECK_PENALTY * failed)
}

const clamp01 = (x: number): number => Math.min(1, Math.max(0, x))

export function gradeAttempt(drill: DrillMusic, events: PlayedEvent[], options: GradeOptions = {}): GradeResult {
  const targets = targetsOf(drill)
  const played = pairNoteEvents(events)
  const step = typicalStep(targets)
  const alignment = alignWithTime(targets, played, step)
  const matched = alignment.match.map(k => (k === null ? null : played[k]!))

  const { timing, msPerBeat } = measureTiming(targets, matched, step)
  const inferred = inferPerHand(targets, matched, options.handSize)
  const loudness = measureLoudness(targets, matched, inferred.fingers)
  const plannedAt = (['right', 'left'] as const)
    .flatMap(hand => plannedPositionStarts(hand, targets.filter(t => t.hand === hand), options.handSize))
    .sort((a, b) => a - b)
  const targetBpm = options.targetBpm ?? drill.tempoBpm
  const playedBpm = msPerBeat === null ? null : 60_000 / msPerBeat

  const { correct, wrong, extra, missed } = alignment.counts
  const total = targets.length
  const coverage = total === 0 ? 0 : (correct + wrong) / total
  const values: Record<Part, number> = {
    accuracy: total + extra === 0 ? 0 : correct / (total + extra),
    timing: timing.cvPercent === null ? 0 : coverage * clamp01(1 - timing.cvPercent / TIMING_ZERO_CV_PERCENT),
    loudness: loudness.sd === null ? 0 : coverage * loudnessValue(loudness),
    positions: coverage * clamp01(1 - Math.abs(inferred.at.length - plannedAt.length) / (plannedAt.length + 1)),
    tempo: playedBpm === null ? 0 : coverage * Math.min(playedBpm, targetBpm) / Math.max(playedBpm, targetBpm),
  }
  const loudnessUnmeasured = correct + wrong > 0 && loudness.sd === null
  const weightSum = loudnessUnmeasured ? 1 - WEIGHTS.loudness : 1
  const scoreParts = Object.fromEntries((Object.keys(WEIGHTS) as Part[]).map(part => [part, {
    value: values[part],
    weight: part === 'loudness' && loudnessUnmeasured ? 0 : WEIGHTS[part] / weightSum,
  }])) as GradeResult['scoreParts']
  const score = 100 * (Object.values(scoreParts) as { value: number, weight: number }[]).reduce((s, p) => s + p.value * p.weight, 0)

  return {
    engineVersion: ENGINE_VERSION,
    score: Math.round(score * 10) / 10,
    scoreParts,
    scoreFormula: SCORE_FORMULA,
    accuracy: { correct, wrong, extra, missed, total },
    timing,
    loudness,
    positionChanges: { planned: plannedAt.length, played: inferred.at.length, at: inferred.at, plannedAt },
    tempo: { targetBpm, playedBpm },
    inferredFingers: inferred.fingers,
    notes: targets.map(t => ({
      outcome: alignment.outcome[t.index]!,
      eventIndex: matched[t.index]?.eventIndex ?? null,
      playedNote: matched[t.index]?.midi ?? null,
    })),
    extras: alignment.extras.map(k => played[k]!.eventIndex),
  }
}
