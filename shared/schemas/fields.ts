import { z } from 'zod'

// Field builders shared by every form and route, so both give the same message.
export function numberField(label: string) {
  return z.number({ error: `${label} must be a number.` }).refine(Number.isFinite, { error: `${label} must be a number.` })
}

export function positiveNumber(label: string, max: number) {
  return numberField(label)
    .refine((v) => v > 0, { error: `${label} must be more than 0.` })
    .refine((v) => v <= max, { error: `${label} must be at most ${max}.` })
}

export function nonNegativeNumber(label: string, max: number) {
  return numberField(label)
    .refine((v) => v >= 0, { error: `${label} can't be negative.` })
    .refine((v) => v <= max, { error: `${label} must be at most ${max}.` })
}

export function wholeNumber(label: string, min: number, max: number) {
  return z
    .number({ error: `${label} must be a whole number.` })
    .int({ error: `${label} must be a whole number.` })
    .min(min, { error: `${label} must be at least ${min}.` })
    .max(max, { error: `${label} must be at most ${max}.` })
}

export function requiredText(label: string, max = 200) {
  return z
    .string({ error: `${label} is required.` })
    .trim()
    .min(1, { error: `${label} is required.` })
    .max(max, { error: `${label}: use at most ${max} characters.` })
}

export const optionalText = (max = 2000) => z.string().trim().max(max, { error: `Use at most ${max} characters.` }).default('')

// ISO 4217 alphabetic code.
export const currencyField = z
  .string({ error: 'Currency is required.' })
  .trim()
  .toUpperCase()
  .regex(/^[A-Z]{3}$/, { error: 'Currency is a three-letter ISO 4217 code such as EUR.' })

export const dateField = (label: string) =>
  z.string({ error: `${label} is required.` }).regex(/^\d{4}-\d{2}-\d{2}$/, { error: `${label} must be a date (YYYY-MM-DD).` })

export const idField = (label: string) => z.number({ error: `Choose a ${label}.` }).int().positive({ error: `Choose a ${label}.` })
