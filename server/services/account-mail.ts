import type { Knex } from 'knex'
import type { SessionUser } from '#shared/roles'
import { serverConfig } from '../utils/config'
import { queueMail, sendMail, type ComposeMail, type DeferredMailKind, type MailMessage } from './mail-outbox'
import { issueToken } from './tokens'

// The account e-mails, queued in the outbox in the transaction of the change they report (accounts.ts); the routes
// answer without waiting for the mail server.
function verificationMessage(user: Pick<SessionUser, 'email' | 'name'>, token: string): MailMessage {
  return {
    to: user.email,
    subject: 'Confirm your e-mail',
    paragraphs: [`Hello ${user.name},`, 'Please confirm this e-mail address to finish setting up your account. The link works once and for 48 hours.'],
    action: { label: 'Confirm my e-mail', url: `${serverConfig().appUrl}/verify?token=${token}` },
  }
}

function passwordResetMessage(user: Pick<SessionUser, 'email' | 'name'>, token: string): MailMessage {
  return {
    to: user.email,
    subject: 'Reset your password',
    paragraphs: [
      `Hello ${user.name},`,
      'Someone asked to reset the password of your account. If it was you, choose a new password with the link below; it works once and for one hour.',
      'If it was not you, ignore this message: your password stays as it is.',
    ],
    action: { label: 'Choose a new password', url: `${serverConfig().appUrl}/reset-password?token=${token}` },
  }
}

export function verificationMail(trx: Knex, user: SessionUser, token: string) {
  return sendMail(verificationMessage(user, token), trx)
}

const DEFERRED_SUBJECTS: Record<DeferredMailKind, string> = {
  'password-reset': 'Reset your password',
  verification: 'Confirm your e-mail',
}

/**
 * A reset link (or a new confirmation link) asked for by address. The request writes one outbox row, the same
 * whether or not the address has an account, so the answer can't tell them apart by its work or its time; the
 * sender looks the account up (composeAccountMail) and sends the link, or nothing.
 */
export async function requestAccountMail(db: Knex, kind: DeferredMailKind, email: string): Promise<void> {
  await queueMail(db, { to: email, subject: DEFERRED_SUBJECTS[kind], paragraphs: [], deferred: kind })
}

/** The outbox sender's half: a link for an enabled account (not yet confirmed, for a confirmation link), else null. */
export const composeAccountMail: ComposeMail = async (trx, message) => {
  const account = trx('users').where({ email: message.to }).whereNull('disabled_at')
  if (message.deferred === 'verification') account.whereNull('email_verified_at')
  const row = await account.first('id', 'email', 'name')
  if (!row) return null
  // A new link replaces any older one of its purpose (tokens.ts).
  if (message.deferred === 'verification') return verificationMessage(row, await issueToken(trx, row.id, 'verify-email'))
  return passwordResetMessage(row, await issueToken(trx, row.id, 'reset-password'))
}

export function signUpAttemptMail(trx: Knex, user: SessionUser) {
  return sendMail({
    to: user.email,
    subject: 'Someone tried to sign up with your address',
    paragraphs: [
      `Hello ${user.name},`,
      'Someone just tried to create a new account with this e-mail address, which already has an account here. Nothing was changed.',
      'If it was you, sign in instead; if you forgot your password, choose a new one from the sign-in page. If it was not you, ignore this message.',
    ],
    action: { label: 'Sign in', url: `${serverConfig().appUrl}/sign-in` },
  }, trx)
}

export function passwordChangedMail(trx: Knex, user: Pick<SessionUser, 'email' | 'name'>) {
  return sendMail({
    to: user.email,
    subject: 'Your password was changed',
    paragraphs: [`Hello ${user.name},`, 'The password of your account was just changed. If you did not do this, reset it now and tell the workshop staff.'],
  }, trx)
}
