import type { Knex } from 'knex'
import QRCode from 'qrcode'
import { serverConfig } from '../utils/config'
import { sendMail } from './mail-outbox'

/** The pickup code as a QR code (SVG), for the member's phone and the staff scanner. */
export function pickupQrSvg(code: string): Promise<string> {
  return QRCode.toString(code, { type: 'svg', margin: 1, errorCorrectionLevel: 'M' })
}

export async function sendPickupMail(db: Knex, jobId: number, kind: 'ready' | 'reminder'): Promise<void> {
  const job = await db('jobs as j').join('users as u', 'u.id', 'j.member_id').where('j.id', jobId).first('j.title', 'j.pickup_code', 'j.pickup_location', 'u.email', 'u.name')
  const qrPng = await QRCode.toBuffer(job.pickup_code, { type: 'png', margin: 1, width: 240 })
  await sendMail({
    to: job.email,
    subject: kind === 'ready' ? `Ready to collect: ${job.title}` : `Your parts are still waiting: ${job.title}`,
    paragraphs: [
      `Hello ${job.name},`,
      kind === 'ready' ? `Your parts for "${job.title}" are ready.` : `Your parts for "${job.title}" are still on the pickup shelf.`,
      `Pickup code: ${job.pickup_code} (shelf ${job.pickup_location}). Show the code or the attached QR code at the desk; it works once.`,
    ],
    action: { label: 'Open the job', url: `${serverConfig().appUrl}/jobs/${jobId}` },
    attachments: [{ filename: `pickup-${job.pickup_code}.png`, content: qrPng.toString('base64'), contentType: 'image/png', encoding: 'base64' }],
  }, db)
}
