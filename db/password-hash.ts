import { Hash } from '@adonisjs/hash'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'

// The same scrypt driver and defaults that nuxt-auth-utils' hashPassword uses, so the CLI's
// seeded hashes verify in the server. Used only outside the server (CLI seeding, tests).
const hasher = new Hash(new Scrypt({}))

export function hashPasswordOffline(password: string): Promise<string> {
  return hasher.make(password)
}
