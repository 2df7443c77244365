// An uploaded file's name as shown and stored: the name a person gave it, never a way to disguise it.
export const MAX_FILE_NAME_CHARS = 120

// Control characters, and the invisible direction and width marks that can make "gvs.exe" read "exe.svg"
// (Unicode TR #36, "Bidirectional Text Spoofing"). The zero-width joiner stays: emoji need it.
// eslint-disable-next-line no-control-regex -- control characters are what it finds
const INVISIBLE = /[\u0000-\u001f\u007f-\u009f\u061c\u200b\u200e\u200f\u202a-\u202e\u2066-\u2069\ufeff]/g

/** Normalised (NFC), without invisible or control characters or folders, at most MAX_FILE_NAME_CHARS, extension kept. */
export function displayFileName(name: string, fallback: string): string {
  const base = name.normalize('NFC').replace(INVISIBLE, '').split(/[/\\]/).pop()!
  const cleaned = base.replace(/\s+/g, ' ').trim().replace(/^\.+/, '').trim()
  if (!cleaned) return fallback
  const characters = [...cleaned]
  if (characters.length <= MAX_FILE_NAME_CHARS) return cleaned
  const dot = cleaned.lastIndexOf('.')
  const extension = dot > 0 && cleaned.length - dot <= 10 ? [...cleaned.slice(dot)] : []
  const stem = characters.slice(0, MAX_FILE_NAME_CHARS - 1 - extension.length)
  return `${stem.join('').trimEnd()}…${extension.join('')}`
}
