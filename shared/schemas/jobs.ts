import { z } from 'zod'
import { idField, optionalText, requiredText, wholeNumber } from './fields'
import { pageQuerySchema } from './paging'

export const MAX_FILES_PER_JOB = 200

export const jobCreateSchema = z.object({
  title: requiredText('Title', 120),
  cutterId: idField('cutter'),
  materialId: idField('material'),
  sheetId: idField('sheet size').optional(),
  notes: optionalText(2000),
})
export type JobCreateInput = z.output<typeof jobCreateSchema>

export const jobUpdateSchema = jobCreateSchema.partial()

export const fileQuantityField = wholeNumber('Copies', 1, 1000)

export const jobFileUpdateSchema = z.object({ quantity: fileQuantityField })

const reasonField = z.string().trim().max(2000, { error: 'Use at most 2000 characters.' })

/** Which group of findings of which revision of a file: the group's key names its kind, cause and limit. */
const groupRefFields = {
  fileId: z.number().int().positive(),
  revision: z.number().int().positive(),
  key: z.string().min(1).max(200),
}

export const submitJobSchema = z.object({
  /** One reason for every group of warnings not given a reason of its own. */
  acknowledgement: reasonField.optional(),
  // Only the groups the member wrote a reason for; the server names any group still without one.
  acknowledgements: z.array(z.object({ ...groupRefFields, reason: reasonField })).max(MAX_FILES_PER_JOB * 50, { error: 'Too many reasons in one submission.' }).optional(),
})

export const reviewCommentSchema = z.object({
  comment: z.string({ error: 'A comment is required.' }).trim().max(4000, { error: 'Use at most 4000 characters.' }).default(''),
  findingRef: z.object(groupRefFields).optional(),
})

export type FindingRef = z.output<typeof reviewCommentSchema>['findingRef'] & {}

export const overrideSchema = z.object({ reason: requiredText('Reason', 1000) })

export const jobListQuerySchema = z.object({
  state: z.string().optional(),
  scope: z.enum(['mine', 'all']).optional(),
  // Pages only: oldest waiting first (the review queue) or newest first.
  order: z.enum(['waiting', 'newest']).optional(),
}).extend(pageQuerySchema.shape)

export const jobFileParamsSchema = z.object({
  id: z.coerce.number().int().positive({ error: 'The job id must be a positive whole number.' }),
  fileId: z.coerce.number().int().positive({ error: 'The file id must be a positive whole number.' }),
})

export const revisionParamsSchema = jobFileParamsSchema.extend({
  revision: z.coerce.number().int().positive({ error: 'The revision must be a positive whole number.' }),
})

export const revisionPartParamsSchema = revisionParamsSchema.extend({
  part: z.enum(['geometry', 'sites'], { error: 'Ask for the geometry or the sites.' }),
})
