import nodemailer, { type Transporter } from 'nodemailer'
import { workshopDisplayName } from '../services/settings'

export interface MailMessage {
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

export function renderMail(message: MailMessage, workshopName: string): { text: string; html: string } {
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

/**
 * Sends through SMTP_URL. Callers send only after the change the mail reports has committed;
 * a mail failure is logged and never undoes that change.
 */
export async function sendMail(message: MailMessage): Promise<boolean> {
  const config = serverConfig()
  transport ??= nodemailer.createTransport(config.smtpUrl)
  const workshopName = await workshopDisplayName(useDb())
  try {
    await transport.sendMail({
      from: config.mailFrom,
      to: message.to,
      subject: `${message.subject} · ${workshopName}`,
      ...renderMail(message, workshopName),
      attachments: message.attachments,
    })
    return true
  } catch (error) {
    console.error(`[mailer] could not send "${message.subject}" to ${message.to}:`, (error as Error).message)
    return false
  }
}
