import { z } from 'zod'

// Form fields sent with an uploaded cut file (multipart text fields arrive as strings).
const optionalId = z.coerce.number({ error: 'Must be a number.' }).int().positive({ error: 'Choose one from the list.' }).optional()

export const analysisFieldsSchema = z.object({
  cutterId: optionalId,
  materialId: optionalId,
  sheetId: optionalId,
  dpi: z.coerce.number({ error: 'DPI must be a number.' }).min(1, { error: 'DPI must be at least 1.' }).max(10_000, { error: 'DPI must be at most 10000.' }).optional(),
  preview: z.enum(['0', '1']).optional(),
})
  .refine((f) => (f.cutterId === undefined) === (f.materialId === undefined), { error: 'Choose both a cutter and a material.', path: ['materialId'] })
export type AnalysisFields = z.output<typeof analysisFieldsSchema>

/** Upload limit for one cut file. */
export const MAX_CUT_FILE_BYTES = 20 * 1024 * 1024
