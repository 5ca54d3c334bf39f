import { h } from 'vue'
import { MailButton, MailParagraph } from '../components'
import { defineMailTemplate, longDate } from '../template'

export interface InvitationMail {
  className: string
  teacherName: string
  link: string
  /** When the link stops working (ISO date or date-time). */
  expiresAt: string
}

export default defineMailTemplate<InvitationMail>({
  subject: d => `${d.teacherName} invites you to ${d.className} on Evenhand`,
  text: d => [
    'Hello,',
    '',
    `${d.teacherName} teaches the piano class "${d.className}" and would like you to practise your fingering drills with it on Evenhand.`,
    'Open this link to join: choose your name and a password, or sign in if you already have an account.',
    `The link works once and until ${longDate(d.expiresAt)}:`,
    '',
    d.link,
    '',
    'If you were not expecting this, ignore this e-mail and nothing happens.',
  ].join('\n'),
  html: d => [
    h(MailParagraph, () => 'Hello,'),
    h(MailParagraph, () => `${d.teacherName} teaches the piano class "${d.className}" and would like you to practise your fingering drills with it on Evenhand.`),
    h(MailParagraph, () => `Join with the button below: choose your name and a password, or sign in if you already have an account. The link works once and until ${longDate(d.expiresAt)}.`),
    h(MailButton, { href: d.link, label: `Join ${d.className}` }),
    h(MailParagraph, () => 'If you were not expecting this, ignore this e-mail and nothing happens.'),
  ],
})
