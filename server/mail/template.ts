// What an e-mail template is, and how one becomes a subject, a plain-text body and an HTML body.
// HTML comes from small Vue components rendered by Vue's own server renderer (the escaping is Vue's);
// the plain text is written by hand beside it, because a good text mail is not stripped HTML.
import { createSSRApp, h } from 'vue'
import type { VNodeChild } from 'vue'
import { renderToString } from 'vue/server-renderer'
import { MailLayout } from './components'

export interface MailTemplate<D> {
  subject: (data: D) => string
  text: (data: D) => string
  /** The body inside the shared layout. */
  html: (data: D) => VNodeChild
  /** A link that stops this kind of mail, shown in the footer and sent as List-Unsubscribe. */
  unsubscribeLink?: (data: D) => string
}

export function defineMailTemplate<D>(template: MailTemplate<D>): MailTemplate<D> {
  return template
}

export interface RenderedMail {
  subject: string
  text: string
  html: string
  unsubscribeLink: string | null
}

export async function renderMail<D>(template: MailTemplate<D>, data: D): Promise<RenderedMail> {
  const subject = template.subject(data)
  const unsubscribeLink = template.unsubscribeLink?.(data) ?? null
  const app = createSSRApp({ render: () => h(MailLayout, { title: subject, unsubscribeLink }, () => template.html(data)) })
  const html = `<!doctype html>\n${await renderToString(app)}`
  const footer = unsubscribeLink ? `\n\n--\nTo stop these e-mails: ${unsubscribeLink}\n` : '\n\n--\nEvenhand, fingering practice for piano students and their teachers\n'
  return { subject, text: template.text(data).trimEnd() + footer, html, unsubscribeLink }
}

/** "Friday 12 December 2026" from a calendar date (YYYY-MM-DD), read as that day wherever the server is. */
export function longDate(isoDate: string): string {
  return new Date(`${isoDate.slice(0, 10)}T12:00:00Z`).toLocaleDateString('en-GB', { weekday: 'long', day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' })
}
