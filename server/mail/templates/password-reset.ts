import { h } from 'vue'
import { MailButton, MailParagraph } from '../components'
import { defineMailTemplate } from '../template'

export interface PasswordResetMail {
  name: string
  link: string
  /** Set when a teacher asked for the link on the student's behalf. */
  requestedBy?: string | null
}

export default defineMailTemplate<PasswordResetMail>({
  subject: () => 'Choose a new Evenhand password',
  text: d => [
    `Hello ${d.name},`,
    '',
    d.requestedBy ? `${d.requestedBy} asked Evenhand to send you a link for choosing a new password.` : 'Someone (we hope you) asked for a new password for your Evenhand account.',
    'Open this link within one hour to choose it; the link works once:',
    '',
    d.link,
    '',
    'If you did not ask for this, ignore this e-mail: your password stays as it is.',
  ].join('\n'),
  html: d => [
    h(MailParagraph, () => `Hello ${d.name},`),
    h(MailParagraph, () => d.requestedBy
      ? `${d.requestedBy} asked Evenhand to send you a link for choosing a new password.`
      : 'Someone (we hope you) asked for a new password for your Evenhand account.'),
    h(MailParagraph, () => 'The link below works once, within one hour.'),
    h(MailButton, { href: d.link, label: 'Choose a new password' }),
    h(MailParagraph, () => 'If you did not ask for this, ignore this e-mail: your password stays as it is.'),
  ],
})
