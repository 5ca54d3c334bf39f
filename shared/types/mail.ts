/** A message the local mail server stored, as /dev/mail lists it. */
export interface DevMailSummary {
  id: string
  date: string | null
  from: string
  to: string
  subject: string
}

export interface DevMail extends DevMailSummary {
  text: string
  html: string | null
}
