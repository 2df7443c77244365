// Where the sign-in page may send a visitor afterwards: only a path on this site. "//host", "/\host" and
// "\\host" are other sites to a browser, and a URL with a scheme is never followed.
const ORIGIN = 'https://kerfbook.invalid'

export function safeNextPath(next: unknown): string | undefined {
  // eslint-disable-next-line no-control-regex -- a control character refuses the path
  if (typeof next !== 'string' || !next.startsWith('/') || /[\\\u0000-\u001f\u007f]/.test(next) || next.startsWith('//')) return undefined
  try {
    const url = new URL(next, ORIGIN)
    return url.origin === ORIGIN ? `${url.pathname}${url.search}${url.hash}` : undefined
  } catch {
    return undefined
  }
}
