// Every e-mail Evenhand sends, by name. To add one: write a template file beside these
// (defineMailTemplate with subject, text and html) and register it here; queueMail then accepts its name and data.
import assignment from './assignment'
import emailChange from './email-change'
import invitation from './invitation'
import passwordReset from './password-reset'
import weeklySummary from './weekly-summary'
import type { MailTemplate } from '../template'

export const mailTemplates = {
  'password-reset': passwordReset,
  'email-change': emailChange,
  'invitation': invitation,
  'assignment': assignment,
  'weekly-summary': weeklySummary,
}

export type MailTemplateName = keyof typeof mailTemplates
export type MailData<K extends MailTemplateName> = (typeof mailTemplates)[K] extends MailTemplate<infer D> ? D : never
