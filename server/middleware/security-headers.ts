// Security headers on every answer. Pages get a Content-Security-Policy that allows scripts only from
// this origin plus the exact inline scripts the Nuxt renderer wrote into that page (by SHA-256), so
// markup smuggled into a page — an uploaded drawing shown inline, say — can never run script.
import { createHash } from 'node:crypto'
import { setResponseHeaders } from 'h3'
import type { NitroApp } from 'nitropack'

const COMMON_HEADERS = {
  'X-Content-Type-Options': 'nosniff',
  // frame-ancestors in the policy is the modern form; X-Frame-Options covers browsers that ignore it.
  'X-Frame-Options': 'DENY',
  'Referrer-Policy': 'strict-origin-when-cross-origin',
  'Cross-Origin-Opener-Policy': 'same-origin',
}

// JSON answers, files and feeds are never documents that should run or load anything.
const NON_PAGE_POLICY = "default-src 'none'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'"

// Vue's style bindings write style attributes and Nuxt inlines critical CSS, so styles stay
// 'unsafe-inline'; styles cannot run script. Images may be data:/blob: URLs of previews and layouts.
function pagePolicy(scriptHashes: string[]): string {
  return [
    "default-src 'self'",
    `script-src 'self' ${scriptHashes.map((hash) => `'sha256-${hash}'`).join(' ')}`.trim(),
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self' data:",
    "connect-src 'self'",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ].join('; ')
}

// Inline <script> elements the browser would execute: no type, a JavaScript type, a module or an
// import map (script-src governs import maps too). JSON data islands such as the Nuxt payload are inert.
const INLINE_SCRIPT = /<script((?:\s+[^>]*)?)>([\s\S]*?)<\/script>/gi
const INERT_TYPE = /\btype\s*=\s*["']?application\/(?:ld\+)?json/i

export function inlineScriptHashes(html: string): string[] {
  const hashes = new Set<string>()
  for (const [, attributes = '', body = ''] of html.matchAll(INLINE_SCRIPT)) {
    if (/\bsrc\s*=/i.test(attributes) || INERT_TYPE.test(attributes) || body.length === 0) continue
    hashes.add(createHash('sha256').update(body, 'utf8').digest('base64'))
  }
  return [...hashes]
}

let pageHookRegistered = false

// The rendered HTML exists only after the page handler ran; the renderer's hook sees it before the
// headers go out. Registered on the first request because the Nitro app does not exist at import.
function registerPagePolicy(nitroApp: NitroApp): void {
  if (pageHookRegistered) return
  pageHookRegistered = true
  nitroApp.hooks.hook('render:response', (response) => {
    if (typeof response.body !== 'string') return
    response.headers = { ...response.headers, 'content-security-policy': pagePolicy(inlineScriptHashes(response.body)) }
  })
}

export default defineEventHandler((event) => {
  setResponseHeaders(event, COMMON_HEADERS)
  // Vite's development client injects and reloads scripts the policy would block; production only.
  if (import.meta.dev) return
  registerPagePolicy(useNitroApp())
  setResponseHeaders(event, { 'Content-Security-Policy': NON_PAGE_POLICY })
})
