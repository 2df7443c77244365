import { composeAccountMail } from '../services/account-mail'
import { deliverAsWorkshop, deliverDueMail, outboxPolicy } from '../services/mail-outbox'

// The outbox's background sender: every MAIL_OUTBOX_INTERVAL_MS (default 250 ms) it delivers the mail that is due,
// one run at a time. It is the only place that talks to the mail server; requests only write rows.
export default defineNitroPlugin((nitro) => {
  if (process.env.MAIL_OUTBOX === 'off') return
  const policy = outboxPolicy()
  let running = false
  const timer = setInterval(
    () => {
      if (running) return
      running = true
      databaseReady()
        .then(() => deliverDueMail(useDb(), (message) => deliverAsWorkshop(useDb(), message), policy, undefined, composeAccountMail))
        .catch((error) => console.error('[mail] sender failed:', error))
        .finally(() => (running = false))
    },
    Number(process.env.MAIL_OUTBOX_INTERVAL_MS || 250),
  )
  timer.unref()
  nitro.hooks.hook('close', () => clearInterval(timer))
})
