// A drill as a MusicXML 4.0 partwise score (one piano part; a grand staff for both hands), with
// the planned fingers as <fingering> marks, so a notation program opens it with the fingering.
//
// Elements written as the MusicXML 4.0 specification defines them: score-partwise, work,
// part-list/score-part, part, measure, attributes (divisions, key/fifths, time, staves, clef),
// direction/metronome and sound@tempo, note (pitch, rest, chord, duration, tie, voice, type, dot,
// staff, notations/tied and technical/fingering) and backup between voices.
import { scoreLayout, noteType, type ScoreEvent } from './score'
import type { DrillMusic } from './types'

export interface MusicXmlExportOptions {
  title?: string
  key?: string | null
  meter?: string | null
}

const escapeXml = (text: string): string => text.replace(/[<>&"']/g, c => ({ '<': '&lt;', '>': '&gt;', '&': '&amp;', '"': '&quot;', '\'': '&apos;' })[c]!)

/** The fewest divisions per quarter note (a divisor of 2880) that make every duration whole. */
function divisionsFor(values: number[]): number {
  for (const d of [1, 2, 3, 4, 6, 8, 12, 16, 24, 32, 48, 64, 96, 192, 960, 2880]) {
    if (values.every(v => Math.abs(v * d - Math.round(v * d)) < 1e-6)) return d
  }
  return 2880
}

function pitchXml(pitch: string): string {
  const match = /^([A-G])(##|#|bb|b)?(-?\d)$/.exec(pitch)!
  const alter = { '##': 2, '#': 1, 'b': -1, 'bb': -2 }[match[2] ?? ''] ?? 0
  return `<pitch><step>${match[1]}</step>${alter ? `<alter>${alter}</alter>` : ''}<octave>${match[3]}</octave></pitch>`
}

function eventXml(event: ScoreEvent, divisions: number, voice: number, staff: number | null, wholeMeasure: boolean): string {
  const duration = Math.round(event.duration * divisions)
  const written = noteType(event.duration)
  const typeXml = written && !wholeMeasure ? `<type>${written.type}</type>${'<dot/>'.repeat(written.dots)}` : ''
  const staffXml = staff ? `<staff>${staff}</staff>` : ''
  if (event.notes.length === 0) {
    return `<note><rest${wholeMeasure ? ' measure="yes"' : ''}/><duration>${duration}</duration><voice>${voice}</voice>${typeXml}${staffXml}</note>`
  }
  return event.notes.map((n, k) => {
    const ties = `${n.tieStop ? '<tie type="stop"/>' : ''}${n.tieStart ? '<tie type="start"/>' : ''}`
    const tied = `${n.tieStop ? '<tied type="stop"/>' : ''}${n.tieStart ? '<tied type="start"/>' : ''}`
    // The finger belongs to the struck note, not to its tied continuation.
    const fingering = n.finger && !n.tieStop ? `<technical><fingering>${n.finger}</fingering></technical>` : ''
    const notations = tied || fingering ? `<notations>${tied}${fingering}</notations>` : ''
    return `<note>${k > 0 ? '<chord/>' : ''}${pitchXml(n.pitch)}<duration>${duration}</duration>${ties}<voice>${voice}</voice>${typeXml}${staffXml}${notations}</note>`
  }).join('')
}

export function exportDrillMusicXml(drill: DrillMusic, options: MusicXmlExportOptions = {}): string {
  const layout = scoreLayout({ ...drill, meter: options.meter, key: options.key })
  const events = layout.staves.flatMap(s => s.measures.flat(2))
  const divisions = divisionsFor([layout.measureBeats, ...events.flatMap(e => [e.onset, e.duration])])
  const grand = layout.staves.length > 1
  const measureDuration = Math.round(layout.measureBeats * divisions)

  const measures: string[] = []
  for (let m = 0; m < layout.measureCount; m++) {
    const parts: string[] = []
    if (m === 0) {
      const clefs = layout.staves.map((s, k) => {
        const number = grand ? ` number="${k + 1}"` : ''
        return s.clef === 'treble' ? `<clef${number}><sign>G</sign><line>2</line></clef>` : `<clef${number}><sign>F</sign><line>4</line></clef>`
      }).join('')
      parts.push(`<attributes><divisions>${divisions}</divisions><key><fifths>${layout.fifths}</fifths></key>`
        + `<time><beats>${layout.beats}</beats><beat-type>${layout.beatType}</beat-type></time>${grand ? '<staves>2</staves>' : ''}${clefs}</attributes>`)
      parts.push(`<direction placement="above"><direction-type><metronome><beat-unit>quarter</beat-unit><per-minute>${drill.tempoBpm}</per-minute></metronome></direction-type>`
        + `<sound tempo="${drill.tempoBpm}"/></direction>`)
    }
    let voice = 0
    let written = 0
    layout.staves.forEach((staff, k) => {
      for (const events of staff.measures[m]!) {
        voice++
        if (written > 0) parts.push(`<backup><duration>${measureDuration}</duration></backup>`)
        const wholeMeasure = events.length === 1 && events[0]!.notes.length === 0
        parts.push(events.map(e => eventXml(e, divisions, voice, grand ? k + 1 : null, wholeMeasure)).join(''))
        written++
      }
    })
    measures.push(`<measure number="${m + 1}">${parts.join('')}</measure>`)
  }

  const title = escapeXml(options.title ?? 'Evenhand drill')
  return `<?xml version="1.0" encoding="UTF-8" standalone="no"?>
<!DOCTYPE score-partwise PUBLIC "-//Recordare//DTD MusicXML 4.0 Partwise//EN" "http://www.musicxml.org/dtds/partwise.dtd">
<score-partwise version="4.0">
<work><work-title>${title}</work-title></work>
<identification><encoding><software>Evenhand</software></encoding></identification>
<part-list><score-part id="P1"><part-name>Piano</part-name></score-part></part-list>
<part id="P1">
${measures.join('\n')}
</part>
</score-partwise>
`
}
