import type { Knex } from 'knex'
import type { SessionUser } from '#shared/roles'
import { issueToken } from './tokens'

// The account e-mails, queued in the outbox (the routes answer without waiting for the mail server).
export function verificationMail(user: SessionUser, token: string, db?: Knex) {
  return sendMail({
    to: user.email,
    subject: 'Confirm your e-mail',
    paragraphs: [`Hello ${user.name},`, 'Please confirm this e-mail address to finish setting up your account. The link works once and for 48 hours.'],
    action: { label: 'Confirm my e-mail', url: `${serverConfig().appUrl}/verify?token=${token}` },
  }, db)
}

/** A new confirmation link for an enabled account not confirmed yet (the older link stops working); else nothing. */
export async function resendVerificationMail(db: Knex, email: string): Promise<boolean> {
  return db.transaction(async (trx) => {
    const row = await trx('users').where({ email }).whereNull('disabled_at').whereNull('email_verified_at').first('id', 'email', 'name', 'role')
    if (!row) return false
    await verificationMail(row as SessionUser, await issueToken(trx, row.id, 'verify-email'), trx)
    return true
  })
}

export function signUpAttemptMail(user: SessionUser) {
  return sendMail({
    to: user.email,
    subject: 'Someone tried to sign up with your address',
    paragraphs: [
      `Hello ${user.name},`,
      'Someone just tried to create a new account with this e-mail address, which already has an account here. Nothing was changed.',
      'If it was you, sign in instead; if you forgot your password, choose a new one from the sign-in page. If it was not you, ignore this message.',
    ],
    action: { label: 'Sign in', url: `${serverConfig().appUrl}/sign-in` },
  })
}

export function passwordResetMail(user: SessionUser, token: string) {
  return sendMail({
    to: user.email,
    subject: 'Reset your password',
    paragraphs: [
      `Hello ${user.name},`,
      'Someone asked to reset the password of your account. If it was you, choose a new password with the link below; it works once and for one hour.',
      'If it was not you, ignore this message: your password stays as it is.',
    ],
    action: { label: 'Choose a new password', url: `${serverConfig().appUrl}/reset-password?token=${token}` },
  })
}

export function passwordChangedMail(user: SessionUser) {
  return sendMail({
    to: user.email,
    subject: 'Your password was changed',
    paragraphs: [`Hello ${user.name},`, 'The password of your account was just changed. If you did not do this, reset it now and tell the workshop staff.'],
  })
}
