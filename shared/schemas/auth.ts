import { z } from 'zod'
import { ROLES } from '../roles'

export const emailField = z
  .string({ error: 'E-mail is required.' })
  .trim()
  .toLowerCase()
  .pipe(z.email({ error: 'Enter an e-mail address like name@example.org.' }))

export const PASSWORD_MIN_LENGTH = 10

export const newPasswordField = z
  .string({ error: 'Password is required.' })
  .min(PASSWORD_MIN_LENGTH, { error: `Use at least ${PASSWORD_MIN_LENGTH} characters.` })
  .max(200, { error: 'Use at most 200 characters.' })

/** The rule of newPasswordField as the forms state it under a new-password field. */
export const NEW_PASSWORD_HINT = `At least ${PASSWORD_MIN_LENGTH} characters.`

export const signUpSchema = z.object({
  name: z.string({ error: 'Name is required.' }).trim().min(1, { error: 'Name is required.' }).max(80, { error: 'Use at most 80 characters.' }),
  email: emailField,
  password: newPasswordField,
})

export const signInSchema = z.object({
  email: emailField,
  password: z.string({ error: 'Password is required.' }).min(1, { error: 'Password is required.' }).max(200),
})

export const forgotPasswordSchema = z.object({ email: emailField })

export const tokenField = z.string({ error: 'The link is incomplete.' }).regex(/^[A-Za-z0-9_-]{20,100}$/, { error: 'The link is incomplete or damaged.' })

export const verifyEmailSchema = z.object({ token: tokenField })

export const resetPasswordSchema = z.object({ token: tokenField, password: newPasswordField })

export const changePasswordSchema = z.object({
  currentPassword: z.string({ error: 'Current password is required.' }).min(1, { error: 'Current password is required.' }),
  newPassword: newPasswordField,
})

export const userUpdateSchema = z
  .object({
    role: z.enum(ROLES, { error: `Role must be one of ${ROLES.join(', ')}.` }).optional(),
    disabled: z.boolean({ error: 'Disabled must be true or false.' }).optional(),
  })
  .refine((v) => v.role !== undefined || v.disabled !== undefined, { error: 'Nothing to change: give a role or disabled.' })

export const idParamSchema = z.object({ id: z.coerce.number({ error: 'The id must be a number.' }).int().positive({ error: 'The id must be a positive whole number.' }) })
