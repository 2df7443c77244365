// The length unit is a setting of the account: saved with the person, sent with /api/me, and checked.
import { describe, expect, it } from 'vitest'
import { client, DEMO_PASSWORD, linkToken, signedIn, uniqueEmail, waitForMail } from './helpers'

describe('the length unit of an account', () => {
  it('is millimetres until the person chooses inches, and stays theirs across sessions', async () => {
    const email = uniqueEmail('units')
    await client().post('/api/auth/sign-up', { name: 'Corwen Ashdale', email, password: DEMO_PASSWORD })
    expect((await client().post('/api/auth/verify', { token: linkToken(await waitForMail(email, /Confirm your e-mail/), '/verify') })).status).toBe(200)
    const person = await signedIn(email)
    expect((await person.get('/api/me')).body.lengthUnit).toBe('mm')

    const bad = await person.patch('/api/me/units', { lengthUnit: 'cubit' })
    expect(bad.status).toBe(400)
    expect(bad.body.data.fields.lengthUnit).toBe('Choose millimetres or inches.')

    expect((await person.patch('/api/me/units', { lengthUnit: 'in' })).body).toEqual({ lengthUnit: 'in' })
    expect((await (await signedIn(email)).get('/api/me')).body.lengthUnit).toBe('in')
    // Someone else's setting is untouched.
    expect((await (await signedIn('ines@example.test')).get('/api/me/units')).body.lengthUnit).toBe('mm')
  })
})
