import { z } from 'zod'
import { CUTTER_KINDS, CUTTER_STATUSES, MATERIAL_FAMILIES, OPERATIONS } from '../catalog'
import { currencyField, dateField, idField, nonNegativeNumber, optionalText, positiveNumber, requiredText, wholeNumber } from './fields'

export const cutterSchema = z.object({
  name: requiredText('Name', 80),
  kind: z.enum(CUTTER_KINDS, { error: `Kind must be one of ${CUTTER_KINDS.join(', ')}.` }),
  bedWidthMm: positiveNumber('Bed width', 20_000),
  bedHeightMm: positiveNumber('Bed height', 20_000),
  maxThicknessMm: positiveNumber('Thickest material', 200),
  pricePerMinuteMinor: wholeNumber('Price per minute', 0, 1_000_000),
  currency: currencyField,
  setupMinutes: wholeNumber('Setup minutes', 0, 240),
  billingIncrementMinutes: wholeNumber('Billing increment', 1, 60),
  bookingGranularityMinutes: wholeNumber('Booking granularity', 5, 240),
  maxSpeedMmPerMin: positiveNumber('Top cutting speed', 200_000),
  // 0 means no acceleration limit in the time model.
  accelMmPerS2: nonNegativeNumber('Acceleration', 100_000),
  rapidMmPerMin: positiveNumber('Rapid speed', 500_000),
  junctionDeviationMm: nonNegativeNumber('Cornering tolerance', 10),
  pierceOverheadS: nonNegativeNumber('Head-down time per pierce', 60),
  status: z.enum(CUTTER_STATUSES, { error: `Status must be one of ${CUTTER_STATUSES.join(', ')}.` }).default('active'),
  notes: optionalText(),
})
export type CutterInput = z.output<typeof cutterSchema>
export const cutterPatchSchema = cutterSchema.partial()

/** Fields only an admin may set: they change what members pay. */
export const CUTTER_PRICE_FIELDS = ['pricePerMinuteMinor', 'currency', 'setupMinutes', 'billingIncrementMinutes'] as const

export const sheetSizeSchema = z.object({
  // An existing stock sheet keeps its id (jobs refer to it); a sheet without one is matched by its exact size, or new.
  id: z.number().int().positive().optional(),
  widthMm: positiveNumber('Sheet width', 20_000),
  heightMm: positiveNumber('Sheet height', 20_000),
  priceMinor: wholeNumber('Sheet price', 0, 100_000_000),
  currency: currencyField,
})

export const cutterKindRuleSchema = z
  .object({
    cutterKind: z.enum(CUTTER_KINDS),
    allowed: z.boolean({ error: 'Say whether it is allowed.' }),
    reason: optionalText(500),
  })
  .refine((rule) => rule.allowed || rule.reason.length > 0, { error: 'Give the reason it is not allowed.', path: ['reason'] })

export const materialSchema = z.object({
  name: requiredText('Name', 80),
  family: z.enum(MATERIAL_FAMILIES, { error: `Family must be one of ${MATERIAL_FAMILIES.join(', ')}.` }),
  thicknessMm: positiveNumber('Thickness', 200),
  hazardNote: optionalText(),
  sheets: z.array(sheetSizeSchema).min(1, { error: 'Add at least one stock sheet size.' }).max(20),
  rules: z
    .array(cutterKindRuleSchema)
    .default([])
    .refine((rules) => new Set(rules.map((r) => r.cutterKind)).size === rules.length, { error: 'One rule per cutter kind.' }),
})
export type MaterialInput = z.output<typeof materialSchema>
export const materialPatchSchema = materialSchema.partial()

export const processSettingSchema = z.object({
  cutterId: idField('cutter'),
  materialId: idField('material'),
  cutSpeedMmPerMin: positiveNumber('Cut speed', 200_000),
  kerfMm: positiveNumber('Kerf', 20),
  pierceS: nonNegativeNumber('Pierce time', 60),
  minBridgeMm: positiveNumber('Minimum bridge', 100),
  minHoleMm: positiveNumber('Minimum hole', 200),
  scoreSpeedMmPerMin: positiveNumber('Score speed', 500_000),
  engraveSpeedMmPerMin: positiveNumber('Engrave speed', 500_000),
  engraveLineIntervalMm: positiveNumber('Engrave line interval', 10),
})
export type ProcessSettingInput = z.output<typeof processSettingSchema>
export const processSettingPatchSchema = processSettingSchema.omit({ cutterId: true, materialId: true }).partial()

export const colourSchema = z.object({
  label: requiredText('Label', 60),
  hex: z
    .string({ error: 'Colour is required.' })
    .trim()
    .toLowerCase()
    .regex(/^#[0-9a-f]{6}$/, { error: 'Colour is a hex value like #12ab34.' }),
  // Largest Euclidean distance in 8-bit RGB that still counts as this colour (the engine's rule).
  tolerance: wholeNumber('Tolerance', 0, 200),
  operation: z.enum(OPERATIONS, { error: `Operation must be one of ${OPERATIONS.join(', ')}.` }),
})
export type ColourInput = z.output<typeof colourSchema>
export const colourPatchSchema = colourSchema.partial()

const clockTime = z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, { error: 'Use a time like 09:30.' })

export const openingHoursSchema = z.object({
  hours: z
    .array(
      z
        .object({ weekday: wholeNumber('Weekday', 1, 7), opensAt: clockTime, closesAt: clockTime })
        .refine((h) => h.opensAt < h.closesAt, { error: 'Closing time must be after opening time.', path: ['closesAt'] }),
    )
    .max(50)
    .superRefine((hours, ctx) => {
      const sorted = [...hours].sort((a, b) => a.weekday - b.weekday || a.opensAt.localeCompare(b.opensAt))
      sorted.forEach((h, i) => {
        const next = sorted[i + 1]
        if (next && next.weekday === h.weekday && next.opensAt < h.closesAt) {
          ctx.addIssue({ code: 'custom', message: 'Two opening periods on the same day overlap.', path: [hours.indexOf(next), 'opensAt'] })
        }
      })
    }),
})
export type OpeningHoursInput = z.output<typeof openingHoursSchema>

const instant = (label: string) => z.iso.datetime({ offset: true, error: `${label} must be a date and time.` })

export const closureSchema = z
  .object({
    cutterId: idField('cutter').nullable().default(null),
    startsAt: instant('Start'),
    endsAt: instant('End'),
    reason: requiredText('Reason', 300),
  })
  .refine((c) => new Date(c.endsAt) > new Date(c.startsAt), { error: 'The end must be after the start.', path: ['endsAt'] })
export type ClosureInput = z.output<typeof closureSchema>

export const signOffSchema = z
  .object({
    userId: idField('member'),
    cutterId: idField('cutter'),
    signedOffOn: dateField('Date of induction'),
    expiresOn: dateField('Expiry date').nullable().default(null),
    note: optionalText(500),
  })
  .refine((s) => !s.expiresOn || s.expiresOn > s.signedOffOn, { error: 'The expiry must be after the induction date.', path: ['expiresOn'] })
export type SignOffInput = z.output<typeof signOffSchema>

export const signOffListQuerySchema = z.object({
  userId: z.coerce.number().int().positive().optional(),
  cutterId: z.coerce.number().int().positive().optional(),
  includeRevoked: z.enum(['true', 'false']).optional(),
})

export const dxfLayerSchema = z.object({
  // DXF layer names are matched without regard to case.
  layer: requiredText('Layer name', 255),
  operation: z.enum(OPERATIONS, { error: `Operation must be one of ${OPERATIONS.join(', ')}.` }),
})
export type DxfLayerInput = z.output<typeof dxfLayerSchema>
export const dxfLayerPatchSchema = dxfLayerSchema.partial()
