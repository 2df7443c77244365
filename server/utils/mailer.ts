import nodemailer, { type Transporter } from 'nodemailer'

/** What the SMTP side needs of a mail (server/services/mail-outbox.ts writes and reads them as rows). */
export interface OutgoingMail {
  to: string
  subject: string
  /** Paragraphs of plain text; the HTML part is built from the same paragraphs. */
  paragraphs: string[]
  action?: { label: string; url: string }
  attachments?: { filename: string; content: string; contentType: string; encoding?: 'base64' }[]
}

let transport: Transporter | undefined

function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!)
}

export function renderMail(message: OutgoingMail, workshopName: string): { text: string; html: string } {
  const text = [
    ...message.paragraphs,
    ...(message.action ? [`${message.action.label}: ${message.action.url}`] : []),
    `— ${workshopName}, sent by Kerfbook`,
  ].join('\n\n')
  const button = message.action
    ? `<p><a href="${escapeHtml(message.action.url)}" style="background:#1f3a5f;color:#fff;padding:10px 16px;border-radius:6px;text-decoration:none">${escapeHtml(message.action.label)}</a></p>`
    : ''
  const html = `<div style="font-family:sans-serif;max-width:560px;color:#1c1917">${message.paragraphs
    .map((p) => `<p>${escapeHtml(p)}</p>`)
    .join('')}${button}<p style="color:#57534e;font-size:13px">— ${escapeHtml(workshopName)}, sent by Kerfbook</p></div>`
  return { text, html }
}

// A mail server that accepts and never answers must not hold the sender: every stage has a deadline.
const SMTP_TIMEOUT_MS = Number(process.env.MAIL_TIMEOUT_MS || 10_000)

/** Delivers one message through SMTP_URL; throws when the mail server refuses, fails or does not answer in time. */
export async function deliverBySmtp(message: OutgoingMail, workshopName: string): Promise<void> {
  const config = serverConfig()
  // Pooled: the sender delivers one mail after another over a kept-open connection.
  transport ??= nodemailer.createTransport({
    url: config.smtpUrl,
    pool: true,
    maxConnections: 1,
    connectionTimeout: SMTP_TIMEOUT_MS,
    greetingTimeout: SMTP_TIMEOUT_MS,
    socketTimeout: SMTP_TIMEOUT_MS,
  })
  await transport.sendMail({
    from: config.mailFrom,
    to: message.to,
    subject: `${message.subject} · ${workshopName}`,
    ...renderMail(message, workshopName),
    attachments: message.attachments,
  })
}
