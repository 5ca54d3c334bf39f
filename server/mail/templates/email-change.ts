import { h } from 'vue'
import { MailButton, MailParagraph } from '../components'
import { defineMailTemplate } from '../template'

export interface EmailChangeMail {
  name: string
  newEmail: string
  link: string
}

export default defineMailTemplate<EmailChangeMail>({
  subject: () => 'Confirm your new e-mail address for Evenhand',
  text: d => [
    `Hello ${d.name},`,
    '',
    `You asked to sign in to Evenhand as ${d.newEmail} from now on.`,
    'Open this link within 24 hours to confirm that this address is yours:',
    '',
    d.link,
    '',
    'Until then you keep signing in with your old address. If you did not ask for this, ignore this e-mail.',
  ].join('\n'),
  html: d => [
    h(MailParagraph, () => `Hello ${d.name},`),
    h(MailParagraph, () => `You asked to sign in to Evenhand as ${d.newEmail} from now on. Confirm within 24 hours that this address is yours.`),
    h(MailButton, { href: d.link, label: 'Confirm this address' }),
    h(MailParagraph, () => 'Until then you keep signing in with your old address. If you did not ask for this, ignore this e-mail.'),
  ],
})
