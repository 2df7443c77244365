import type { Knex } from 'knex'
import type { FindingGroup } from '#shared/finding-groups'
import type { SessionUser } from '#shared/roles'
import { InvalidInput } from '../utils/errors'
import type { FileFindingGroups } from './job-revisions'

// A member accepts a group of warnings once, with one reason, for one revision of a file; a new
// revision has new findings and asks again. Staff review, the run sheet and the mails read these rows.

export interface AcknowledgementInput {
  fileId: number
  revision: number
  key: string
  reason: string
}

export interface WarningGroupView {
  fileId: number
  fileName: string
  revision: number
  group: FindingGroup
  acknowledgement: { reason: string; byName: string; at: string } | null
}

const MIN_REASON_CHARS = 5

/** Every warning group of the current revisions, with the member's reason where one is on record. */
export async function acknowledgedGroups(db: Knex, fileGroups: FileFindingGroups[]): Promise<WarningGroupView[]> {
  const rows = await db('finding_acknowledgements as a')
    .join('users as u', 'u.id', 'a.acknowledged_by')
    .whereIn('a.file_revision_id', fileGroups.map((f) => f.revisionId))
    .select('a.file_revision_id', 'a.group_key', 'a.reason', 'a.created_at', 'u.name')
  const byKey = new Map(rows.map((row) => [`${row.file_revision_id}|${row.group_key}`, { reason: row.reason as string, byName: row.name as string, at: row.created_at as string }]))
  return fileGroups.flatMap((file) =>
    file.groups
      .filter((group) => group.severity === 'warning')
      .map((group) => ({ fileId: file.fileId, fileName: file.fileName, revision: file.revision, group, acknowledgement: byKey.get(`${file.revisionId}|${group.key}`) ?? null })),
  )
}

export function unacknowledgedWarnings(groups: WarningGroupView[]): WarningGroupView[] {
  return groups.filter((g) => g.acknowledgement === null)
}

/**
 * Records the member's reasons for the warning groups still open. A reason given for one group wins;
 * `sameReasonForAll` covers the rest. Every open group must end up with a reason of a few words.
 */
export async function recordAcknowledgements(
  trx: Knex,
  member: SessionUser,
  fileGroups: FileFindingGroups[],
  open: WarningGroupView[],
  given: AcknowledgementInput[],
  sameReasonForAll: string,
): Promise<number> {
  const revisionIdOf = new Map(fileGroups.map((f) => [`${f.fileId}/${f.revision}`, f.revisionId]))
  const refOf = (fileId: number, revision: number, key: string) => JSON.stringify([fileId, revision, key])
  const reasonFor = new Map(given.filter((a) => a.reason.trim()).map((a) => [refOf(a.fileId, a.revision, a.key), a.reason.trim()]))
  if (given.some((a) => !open.some((g) => g.fileId === a.fileId && g.revision === a.revision && g.group.key === a.key))) {
    throw new InvalidInput('One of the acknowledged warnings is no longer open on this job; reload the page and try again.')
  }
  const missing: string[] = []
  const rows = open.map((g) => {
    const reason = reasonFor.get(refOf(g.fileId, g.revision, g.group.key)) || sameReasonForAll.trim()
    if (reason.length < MIN_REASON_CHARS) missing.push(g.group.key)
    return { file_revision_id: revisionIdOf.get(`${g.fileId}/${g.revision}`)!, group_key: g.group.key, reason, acknowledged_by: member.id }
  })
  if (missing.length > 0) {
    throw new InvalidInput(
      `Say in a few words why ${missing.length === 1 ? 'the warning group is' : `each of the ${missing.length} warning groups is`} fine (for example: "the 1.5 mm hinges are meant to fold").`,
      { fields: { acknowledgement: 'Please give a reason for each group of warnings.' }, groups: missing },
    )
  }
  if (rows.length > 0) await trx('finding_acknowledgements').insert(rows).onConflict(['file_revision_id', 'group_key']).merge(['reason', 'acknowledged_by'])
  return rows.length
}
