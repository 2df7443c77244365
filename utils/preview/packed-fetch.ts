// Getting a revision's packed preview geometry and finding sites into the browser. The job routes serve the
// plain bytes (gzip is only their Content-Encoding, undone by the browser); the check page's answer carries
// them inline as base64 of the gzipped bytes, undone here with the platform's DecompressionStream.
import { decodeGeometry, decodeSites, type PreviewGeometry } from '#shared/packed-analysis'
import type { FindingSites } from '#shared/finding-groups'

export function base64Bytes(base64: string): Uint8Array {
  const text = atob(base64)
  const bytes = new Uint8Array(text.length)
  for (let i = 0; i < text.length; i++) bytes[i] = text.charCodeAt(i)
  return bytes
}

export async function gunzip(bytes: Uint8Array): Promise<ArrayBuffer> {
  const stream = new Blob([bytes as BlobPart]).stream().pipeThrough(new DecompressionStream('gzip'))
  return new Response(stream).arrayBuffer()
}

/** Base64 of gzipped bytes → the plain bytes, ready for decodeGeometry or decodeSites. */
export async function gunzipBase64(base64: string): Promise<ArrayBuffer> {
  return gunzip(base64Bytes(base64))
}

export async function decodeGeometryGz(base64: string): Promise<PreviewGeometry> {
  return decodeGeometry(await gunzipBase64(base64))
}

export async function decodeSitesGz(base64: string): Promise<FindingSites> {
  return decodeSites(await gunzipBase64(base64))
}

/** GETs `url` (same origin, with the session cookie) and returns its body as bytes; a refusal throws the server's own message. */
export async function fetchBytes(url: string, signal?: AbortSignal): Promise<ArrayBuffer> {
  const response = await fetch(url, { credentials: 'same-origin', headers: { accept: 'application/octet-stream' }, signal })
  if (!response.ok) {
    const answer = (await response.json().catch(() => null)) as { message?: string } | null
    throw new Error(answer?.message ?? `The preview could not be loaded (the server answered ${response.status}).`)
  }
  return response.arrayBuffer()
}
