// Builds the invented demo studio once; a second run finds the demo teacher and leaves everything as it is.
import { randomUUID } from 'node:crypto'
import type { Knex } from 'knex'
import { ENGINE_VERSION, gradeAttempt } from '../shared/engine'
import { hashPassword } from '../scripts/lib/password'
import { assignments, classes, dailyStudent, DEMO_PASSWORD, drills, drillSets, students, teacher } from './demo/studio'
import { performDrill } from './demo/performance'
import { seededRandom } from '../shared/utils/random'
import { endOfDueDay } from '../shared/utils/dueDate'

const DAY_MS = 86_400_000

export async function seed(knex: Knex): Promise<void> {
  if (await knex('users').where({ email: teacher.email }).first()) {
    console.error('demo studio already present')
    return
  }
  const passwordHash = await hashPassword(DEMO_PASSWORD)
  await knex.transaction(async (trx) => {
    const [teacherId] = await trx('users').insert({ email: teacher.email, name: teacher.name, role: 'teacher', password_hash: passwordHash })
    const studentIds = new Map<string, number>()
    for (const s of students) {
      const [id] = await trx('users').insert({ email: s.email, name: s.name, role: 'student', password_hash: passwordHash, guardian_email: s.guardian })
      studentIds.set(s.email, id!)
    }
    const classIds = new Map<string, number>()
    for (const c of classes) {
      const [id] = await trx('classes').insert({ teacher_id: teacherId, name: c.name, join_code: c.joinCode })
      classIds.set(c.name, id!)
      await trx('class_members').insert(c.members.map(email => ({ class_id: id, student_id: studentIds.get(email) })))
    }
    const drillIds = new Map<string, number>()
    for (const d of drills) {
      const notes = JSON.stringify(d.notes)
      const [id] = await trx('drills').insert({
        owner_id: teacherId, title: d.title, description: d.description, kind: d.kind, hand: d.hand,
        key_signature: d.key, meter: d.meter, tempo_bpm: d.tempoBpm, notes, source: 'typed', version: 1, is_public: d.isPublic,
        level: d.level, tags: JSON.stringify(d.tags),
      })
      await trx('drill_versions').insert({ drill_id: id, version: 1, hand: d.hand, tempo_bpm: d.tempoBpm, notes })
      drillIds.set(d.slug, id!)
    }
    const setIds: number[] = []
    for (const set of drillSets) {
      const [id] = await trx('drill_sets').insert({ owner_id: teacherId, title: set.title, description: set.description })
      setIds.push(id!)
      await trx('drill_set_items').insert(set.items.map((item, position) => ({
        drill_set_id: id, drill_id: drillIds.get(item.slug), position, target_tempo_bpm: item.targetTempoBpm, target_score: item.targetScore,
      })))
    }

    const random = seededRandom(20261201)
    const now = Date.now()
    for (const a of assignments) {
      const [assignmentId] = await trx('assignments').insert({
        drill_set_id: setIds[a.set], assigned_by: teacherId, note: a.note,
        class_id: a.className ? classIds.get(a.className) : null,
        student_id: a.studentEmail ? studentIds.get(a.studentEmail) : null,
        // The demo studio keeps UTC: the due day ends at midnight UTC.
        ...dueOnDay(new Date(now + a.dueInDays * DAY_MS)),
        created_at: new Date(now - 24 * DAY_MS),
      })
      const members = a.className ? classes.find(c => c.name === a.className)!.members : [a.studentEmail!]
      for (const email of members) {
        const student = students.find(s => s.email === email)!
        for (const item of drillSets[a.set]!.items) {
          const drill = drills.find(d => d.slug === item.slug)!
          // A few weeks of practice, getting steadier and closer to the target tempo.
          const daily = email === dailyStudent
          const sessions = daily ? 21 : 3 + Math.floor(random() * 6)
          for (let k = 0; k < sessions; k++) {
            const progress = sessions === 1 ? 1 : k / (sessions - 1)
            const tempoBpm = Math.round(item.targetTempoBpm * (0.75 + 0.25 * progress))
            const skill = Math.min(0.97, student.skill + 0.25 * progress)
            const events = performDrill(drill.notes, { tempoBpm, skill, accentFinger: student.accent }, random)
            const result = gradeAttempt({ hand: drill.hand, tempoBpm: drill.tempoBpm, notes: drill.notes }, events, { targetBpm: item.targetTempoBpm })
            // The daily student plays each drill once a day, the last time an hour or two ago.
            const startedAt = daily
              ? new Date(now - (20 - k) * DAY_MS - (1 + random()) * 3_600_000)
              : new Date(now - (21 - 20 * progress) * DAY_MS - random() * 6 * 3_600_000)
            await trx('attempts').insert({
              id: randomUUID(), student_id: studentIds.get(email), drill_id: drillIds.get(item.slug), drill_version: 1,
              assignment_id: assignmentId, started_at: startedAt, created_at: startedAt, tempo_bpm: tempoBpm,
              input_device: k % 3 === 0 ? 'screen' : 'midi', device_name: k % 3 === 0 ? null : 'Demo digital piano',
              events: JSON.stringify(events), pedal: null, score: Math.round(result.score), result: JSON.stringify(result), engine_version: ENGINE_VERSION,
            })
          }
        }
      }
    }
    if (teacherId) console.error(`seeded the demo studio: ${students.length} students, ${drills.length} drills`)
  })
}

function dueOnDay(day: Date): { due_on: string, time_zone: string, due_at: Date } {
  const dueOn = day.toISOString().slice(0, 10)
  return { due_on: dueOn, time_zone: 'UTC', due_at: endOfDueDay(dueOn, 'UTC') }
}
