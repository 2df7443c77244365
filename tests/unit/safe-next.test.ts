import { describe, expect, it } from 'vitest'
import { safeNextPath } from '../../utils/safe-next'

describe('the sign-in page’s next address', () => {
  it.each(['/', '/jobs', '/jobs/12?tab=files#top', '/staff/review'])('follows a path on this site: %s', (path) => {
    expect(safeNextPath(path)).toBe(path)
  })

  it.each([
    '//evil.example',
    '//evil.example/jobs',
    '/\\evil.example',
    '\\\\evil.example',
    '/\t/evil.example',
    'https://evil.example',
    'javascript:alert(1)',
    'jobs',
    '',
    undefined,
    ['/jobs', '//evil.example'],
  ])('refuses %j', (next) => {
    expect(safeNextPath(next)).toBeUndefined()
  })
})
