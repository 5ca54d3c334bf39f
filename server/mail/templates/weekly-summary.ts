import { h } from 'vue'
import { MailParagraph, MailTable } from '../components'
import { defineMailTemplate, longDate } from '../template'

export interface WeeklySummaryMail {
  studentName: string
  /** Monday of the week (YYYY-MM-DD). */
  weekStart: string
  /** Minutes as measured, unrounded: the words round them. */
  days: { date: string, minutes: number, attempts: number }[]
  targets: { setTitle: string, drillTitle: string, dueOn: string | null, targetScore: number | null, bestScore: number | null }[]
  comments: { teacherName: string, drillTitle: string, body: string, date: string }[]
  appLink: string
  unsubscribeLink: string
}

const weekday = (iso: string): string => new Date(`${iso}T12:00:00Z`).toLocaleDateString('en-GB', { weekday: 'long', day: 'numeric', month: 'short', timeZone: 'UTC' })
function minutes(n: number): string {
  if (n <= 0) return 'no practice'
  if (n < 1) return 'less than a minute'
  const whole = Math.round(n)
  return whole === 1 ? '1 minute' : `${whole} minutes`
}
const plural = (n: number, one: string): string => `${n} ${one}${n === 1 ? '' : 's'}`

function opening(d: WeeklySummaryMail): string {
  const total = d.days.reduce((sum, day) => sum + day.minutes, 0)
  const attempts = d.days.reduce((sum, day) => sum + day.attempts, 0)
  const activeDays = d.days.filter(day => day.attempts > 0).length
  if (!attempts) return `${d.studentName} did not practise with Evenhand in the week from ${longDate(d.weekStart)}.`
  return `In the week from ${longDate(d.weekStart)}, ${d.studentName} played drills for ${minutes(total)} on ${plural(activeDays, 'day')}, with ${plural(attempts, 'attempt')} in all.`
}

function scoreLine(t: WeeklySummaryMail['targets'][number]): string {
  const best = t.bestScore == null ? 'not played this week' : `best score ${t.bestScore}`
  if (t.targetScore == null) return best
  if (t.bestScore == null) return `${best} (the goal is ${t.targetScore})`
  return t.bestScore >= t.targetScore ? `${best}, the goal of ${t.targetScore} reached` : `${best}, ${t.targetScore - t.bestScore} short of the goal of ${t.targetScore}`
}

export default defineMailTemplate<WeeklySummaryMail>({
  subject: d => `${d.studentName}'s piano practice, week of ${longDate(d.weekStart)}`,
  unsubscribeLink: d => d.unsubscribeLink,
  text: d => [
    'Hello,',
    '',
    opening(d),
    '',
    'Practice each day (time spent playing drills):',
    ...d.days.map(day => `  ${weekday(day.date)}: ${minutes(day.minutes)}${day.attempts ? `, ${plural(day.attempts, 'attempt')}` : ''}`),
    '',
    ...(d.targets.length
      ? ['Current drills and their goals (scores are out of 100):', ...d.targets.map(t => `  ${t.drillTitle} (${t.setTitle}${t.dueOn ? `, due ${longDate(t.dueOn)}` : ''}): ${scoreLine(t)}`)]
      : ['No drills are assigned at the moment.']),
    '',
    ...(d.comments.length
      ? ['New comments from the teacher:', ...d.comments.flatMap(c => [`  ${c.teacherName} on ${c.drillTitle} (${weekday(c.date)}):`, `  "${c.body}"`])]
      : ['The teacher wrote no new comments this week.']),
    '',
    `${d.studentName} can see every attempt in Evenhand: ${d.appLink}`,
  ].join('\n'),
  html: d => [
    h(MailParagraph, () => 'Hello,'),
    h(MailParagraph, () => opening(d)),
    h('h2', { style: 'font-size:17px;margin:20px 0 8px' }, 'Practice each day'),
    h(MailTable, { head: ['Day', 'Time playing drills', 'Attempts'], rows: d.days.map(day => [weekday(day.date), minutes(day.minutes), String(day.attempts)]) }),
    h('h2', { style: 'font-size:17px;margin:20px 0 8px' }, 'Current drills and their goals'),
    d.targets.length
      ? h(MailTable, { head: ['Drill', 'Set and due date', 'This week (out of 100)'], rows: d.targets.map(t => [t.drillTitle, `${t.setTitle}${t.dueOn ? `, due ${longDate(t.dueOn)}` : ''}`, scoreLine(t)]) })
      : h(MailParagraph, () => 'No drills are assigned at the moment.'),
    h('h2', { style: 'font-size:17px;margin:20px 0 8px' }, 'New comments from the teacher'),
    d.comments.length
      ? d.comments.map(c => h('blockquote', { style: 'margin:0 0 12px;padding:8px 14px;border-left:4px solid #d3eee9' }, [
          h('p', { style: 'margin:0 0 4px;font-weight:700' }, `${c.teacherName} on ${c.drillTitle} (${weekday(c.date)})`),
          h('p', { style: 'margin:0;white-space:pre-line' }, c.body),
        ]))
      : h(MailParagraph, () => 'The teacher wrote no new comments this week.'),
  ],
})
