// The invented demo studio: people, classes and drills of our own making. Fingerings are the
// usual teaching fingerings (common practice), written by hand.
import type { DrillKind, DrillNote, Hand } from '../../shared/types/drill'

export const DEMO_PASSWORD = 'evenhand-demo'

export const teacher = { email: 'teacher@evenhand.test', name: 'Wren Halloway' }

export const students = [
  { email: 'student@evenhand.test', name: 'Noor Castellan', guardian: null, skill: 0.7, accent: 1 },
  { email: 'theo@evenhand.test', name: 'Theo Marchetti', guardian: 'marchetti.family@evenhand.test', skill: 0.4, accent: 0 },
  { email: 'ada@evenhand.test', name: 'Ada Lindqvist', guardian: 'lindqvist.home@evenhand.test', skill: 0.55, accent: 4 },
  { email: 'samir@evenhand.test', name: 'Samir Okonkwo', guardian: null, skill: 0.8, accent: 0 },
  { email: 'lucia@evenhand.test', name: 'Lucía Ferreyra', guardian: null, skill: 0.65, accent: 1 },
  { email: 'jonah@evenhand.test', name: 'Jonah Pell', guardian: 'pell.parents@evenhand.test', skill: 0.35, accent: 5 },
] as const

/**
 * The demo's story: Noor practises every day of the three weeks, so her progress pages show a
 * timing spread that narrows week by week while her thumb stays louder than her other fingers.
 */
export const dailyStudent = 'student@evenhand.test'

export const classes = [
  { name: 'Tuesday Starters', joinCode: 'TUE4KQ', members: ['student@evenhand.test', 'theo@evenhand.test', 'ada@evenhand.test'] },
  { name: 'Thursday Developing', joinCode: 'THU7RM', members: ['student@evenhand.test', 'samir@evenhand.test', 'lucia@evenhand.test', 'jonah@evenhand.test'] },
]

export interface DemoDrill {
  slug: string
  title: string
  description: string
  kind: Exclude<DrillKind, 'other'>
  hand: Hand | 'both'
  key: string
  meter: string
  tempoBpm: number
  isPublic: boolean
  /** Our own level, 1 to 8. */
  level: number
  tags: string[]
  notes: DrillNote[]
}

/** A single line: one pitch and finger per step, each `length` beats long. */
function line(pitches: string, fingers: string, length: number, hand?: Hand, startBeat = 0): DrillNote[] {
  const p = pitches.trim().split(/\s+/)
  const f = fingers.trim().split(/\s+/).map(Number)
  if (p.length !== f.length) throw new Error(`demo drill: ${p.length} pitches but ${f.length} fingers`)
  return p.map((pitch, i) => ({ pitch, beat: startBeat + i * length, length, finger: f[i]!, ...(hand ? { hand } : {}) }))
}

/** Chords given as `C4+E4+G4`, fingers as `1+3+5`. */
function chords(pitches: string, fingers: string, length: number): DrillNote[] {
  const p = pitches.trim().split(/\s+/)
  const f = fingers.trim().split(/\s+/)
  return p.flatMap((chord, i) => {
    const cf = f[i]!.split('+').map(Number)
    return chord.split('+').map((pitch, j) => ({ pitch, beat: i * length, length, finger: cf[j]! }))
  })
}

export const drills: DemoDrill[] = [
  {
    slug: 'c-major-rh', title: 'C major scale, right hand', kind: 'scale', hand: 'right', key: 'C major', meter: '4/4', tempoBpm: 72, isPublic: true, level: 1, tags: ['warm-up'],
    description: 'One octave up and down in quavers. Keep the thumb moving under early, before the 3 lands.',
    notes: line('C4 D4 E4 F4 G4 A4 B4 C5 B4 A4 G4 F4 E4 D4 C4', '1 2 3 1 2 3 4 5 4 3 2 1 3 2 1', 0.5),
  },
  {
    slug: 'g-major-rh-2oct', title: 'G major scale, right hand, two octaves', kind: 'scale', hand: 'right', key: 'G major', meter: '4/4', tempoBpm: 80, isPublic: false, level: 3, tags: ['two octaves'],
    description: 'Two octaves ascending. The F sharp falls to finger 4 in each octave.',
    notes: line('G3 A3 B3 C4 D4 E4 F#4 G4 A4 B4 C5 D5 E5 F#5 G5', '1 2 3 1 2 3 4 1 2 3 1 2 3 4 5', 0.5),
  },
  {
    slug: 'f-major-lh', title: 'F major scale, left hand', kind: 'scale', hand: 'left', key: 'F major', meter: '4/4', tempoBpm: 66, isPublic: false, level: 2, tags: ['warm-up'],
    description: 'One octave up and down. Cross 3 over the thumb onto B flat going up.',
    notes: line('F3 G3 A3 Bb3 C4 D4 E4 F4 E4 D4 C4 Bb3 A3 G3 F3', '5 4 3 2 1 3 2 1 2 3 1 2 3 4 5', 0.5),
  },
  {
    slug: 'd-major-ht', title: 'D major scale, hands together', kind: 'scale', hand: 'both', key: 'D major', meter: '4/4', tempoBpm: 60, isPublic: false, level: 4, tags: ['hands together'],
    description: 'One octave ascending, an octave apart. The hands pass their thumbs at different moments: listen for evenness there.',
    notes: [
      ...line('D4 E4 F#4 G4 A4 B4 C#5 D5', '1 2 3 1 2 3 4 5', 0.5, 'right'),
      ...line('D3 E3 F#3 G3 A3 B3 C#4 D4', '5 4 3 2 1 3 2 1', 0.5, 'left'),
    ],
  },
  {
    slug: 'c-arpeggio-rh', title: 'C major arpeggio, right hand', kind: 'arpeggio', hand: 'right', key: 'C major', meter: '3/4', tempoBpm: 69, isPublic: true, level: 2, tags: ['thumb-under'],
    description: 'Two octaves up and back. Let the thumb pass under without a bump in the sound.',
    notes: line('C4 E4 G4 C5 E5 G5 C6 G5 E5 C5 G4 E4 C4', '1 2 3 1 2 3 5 3 2 1 3 2 1', 0.5),
  },
  {
    slug: 'a-minor-arpeggio-lh', title: 'A minor arpeggio, left hand', kind: 'arpeggio', hand: 'left', key: 'A minor', meter: '3/4', tempoBpm: 63, isPublic: false, level: 3, tags: ['thumb-under'],
    description: 'Two octaves ascending. Finger 4 takes the C; the 2 crosses over after the thumb.',
    notes: line('A2 C3 E3 A3 C4 E4 A4', '5 4 2 1 4 2 1', 0.5),
  },
  {
    slug: 'five-c-rh', title: 'Five-finger pattern in C, right hand', kind: 'five-finger', hand: 'right', key: 'C major', meter: '4/4', tempoBpm: 84, isPublic: true, level: 1, tags: ['beginner', 'warm-up'],
    description: 'Up and down the five keys, one finger per key. Aim for five equally loud fingers.',
    notes: line('C4 D4 E4 F4 G4 F4 E4 D4 C4', '1 2 3 4 5 4 3 2 1', 0.5),
  },
  {
    slug: 'five-g-lh', title: 'Five-finger pattern in G, left hand', kind: 'five-finger', hand: 'left', key: 'G major', meter: '4/4', tempoBpm: 76, isPublic: false, level: 1, tags: ['beginner'],
    description: 'Little finger on G, thumb on D, and back. Keep the fourth finger as strong as the others.',
    notes: line('G2 A2 B2 C3 D3 C3 B2 A2 G2', '5 4 3 2 1 2 3 4 5', 0.5),
  },
  {
    slug: 'three-step-sequence', title: 'Three-note steps, right hand', kind: 'sequence', hand: 'right', key: 'C major', meter: '3/4', tempoBpm: 72, isPublic: false, level: 2, tags: ['legato'],
    description: 'A three-note shape climbing a step at a time. The same fingers for every group; move the hand between groups without a gap.',
    notes: line('C4 D4 E4 D4 E4 F4 E4 F4 G4 F4 G4 A4 G4 A4 B4 A4 B4 C5', '1 2 3 1 2 3 1 2 3 1 2 3 1 2 3 1 2 3', 0.5),
  },
  {
    slug: 'b-flat-major-rh', title: 'B flat major scale, right hand', kind: 'scale', hand: 'right', key: 'B flat major', meter: '4/4', tempoBpm: 66, isPublic: false, level: 3, tags: ['black keys'],
    description: 'One octave ascending. The thumb plays only C and F; finger 4 always lands on B flat.',
    notes: line('Bb3 C4 D4 Eb4 F4 G4 A4 Bb4', '2 1 2 3 1 2 3 4', 0.5),
  },
  {
    slug: 'c-cadence-chords', title: 'Cadence chords in C, right hand', kind: 'passage', hand: 'right', key: 'C major', meter: '4/4', tempoBpm: 60, isPublic: false, level: 2, tags: ['chords'],
    description: 'I – IV – V – I in close position. All notes of a chord together, and equally loud.',
    notes: chords('C4+E4+G4 C4+F4+A4 B3+D4+G4 C4+E4+G4', '1+3+5 1+2+4 1+2+5 1+3+5', 1),
  },
  {
    slug: 'harbour-lights', title: 'Harbour Lights (study), hands together', kind: 'passage', hand: 'both', key: 'G major', meter: '4/4', tempoBpm: 70, isPublic: false, level: 4, tags: ['hands together', 'exam piece'],
    description: 'A short study of our own: a stepwise tune over a left-hand fifth that moves once.',
    notes: [
      ...line('B4 A4 G4 A4 B4 D5 C5 B4 A4 G4 A4 G4', '3 2 1 2 3 5 4 3 2 1 2 1', 0.5, 'right'),
      ...line('G2 D3 G2 D3 C3 G3 D3 A3 G2 D3 G2 D3', '5 1 5 1 5 1 5 1 5 1 5 1', 0.5, 'left'),
    ],
  },
]

export const drillSets = [
  { title: 'First steps: five fingers and C', description: 'Warm-ups for the first month.', items: [
    { slug: 'five-c-rh', targetTempoBpm: 84, targetScore: 80 },
    { slug: 'c-major-rh', targetTempoBpm: 72, targetScore: 75 },
    { slug: 'c-arpeggio-rh', targetTempoBpm: 63, targetScore: 70 },
  ] },
  { title: 'Sharps and sequences', description: 'G and D major with a climbing shape.', items: [
    { slug: 'g-major-rh-2oct', targetTempoBpm: 76, targetScore: 75 },
    { slug: 'd-major-ht', targetTempoBpm: 56, targetScore: 70 },
    { slug: 'three-step-sequence', targetTempoBpm: 72, targetScore: 75 },
  ] },
  { title: 'Left hand focus', description: 'Give the left hand the same evenness as the right.', items: [
    { slug: 'f-major-lh', targetTempoBpm: 66, targetScore: 75 },
    { slug: 'a-minor-arpeggio-lh', targetTempoBpm: 60, targetScore: 70 },
    { slug: 'five-g-lh', targetTempoBpm: 76, targetScore: 80 },
  ] },
  { title: 'Flats, chords and a study', description: 'For the spring concert.', items: [
    { slug: 'b-flat-major-rh', targetTempoBpm: 63, targetScore: 75 },
    { slug: 'c-cadence-chords', targetTempoBpm: 60, targetScore: 80 },
    { slug: 'harbour-lights', targetTempoBpm: 66, targetScore: 70 },
  ] },
]

/** Assignments by drill set index; due dates in days from the day the seed runs. */
export const assignments = [
  { set: 0, className: 'Tuesday Starters', dueInDays: 5, note: 'Five minutes a day, slowly first.' },
  { set: 1, className: 'Thursday Developing', dueInDays: -2, note: 'Hands separately before together.' },
  { set: 2, studentEmail: 'student@evenhand.test', dueInDays: 10, note: 'Noor: your left hand is ready for this.' },
  { set: 3, className: 'Thursday Developing', dueInDays: 14, note: null },
]
