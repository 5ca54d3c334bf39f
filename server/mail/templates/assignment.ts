import { h } from 'vue'
import { MailButton, MailParagraph } from '../components'
import { defineMailTemplate, longDate } from '../template'

export interface AssignmentMail {
  studentName: string
  teacherName: string
  setTitle: string
  /** Calendar date (YYYY-MM-DD) in the teacher's time zone, or null for no due date. */
  dueOn: string | null
  note: string | null
  link: string
}

function due(d: AssignmentMail): string {
  return d.dueOn ? `Please have it practised by ${longDate(d.dueOn)}.` : 'There is no due date.'
}

export default defineMailTemplate<AssignmentMail>({
  subject: d => `New practice from ${d.teacherName}: ${d.setTitle}`,
  text: d => [
    `Hello ${d.studentName},`,
    '',
    `${d.teacherName} has given you the drill set "${d.setTitle}". ${due(d)}`,
    ...(d.note ? ['', `${d.teacherName} adds:`, d.note] : []),
    '',
    'Open it here:',
    d.link,
    '',
    'Warm up first, take breaks, and stop if anything hurts.',
  ].join('\n'),
  html: d => [
    h(MailParagraph, () => `Hello ${d.studentName},`),
    h(MailParagraph, () => `${d.teacherName} has given you the drill set "${d.setTitle}". ${due(d)}`),
    d.note ? h('blockquote', { style: 'margin:0 0 14px;padding:8px 14px;border-left:4px solid #d3eee9;white-space:pre-line' }, d.note) : null,
    h(MailButton, { href: d.link, label: 'Open the drill set' }),
    h(MailParagraph, () => 'Warm up first, take breaks, and stop if anything hurts.'),
  ],
})
