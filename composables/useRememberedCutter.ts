// The cutter a person last chose on a page, kept in a cookie so a reload or a bookmark (rendered on
// the server) opens on the same cutter as the browser would.
export function useRememberedCutter(page: 'calendar' | 'run-sheet') {
  return useCookie<number | null>(`kerfbook-${page}-cutter`, { default: () => null, maxAge: 60 * 60 * 24 * 365, sameSite: 'lax' })
}
