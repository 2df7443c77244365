import { DateTime } from 'luxon'
import { formatLength, formatPathLength, formatSize, type LengthUnit } from '#shared/units'

// Display formatting shared by every page. Money arrives as integer minor units (ISO 4217).
export function formatMoney(amountMinor: number, currency: string): string {
  const format = new Intl.NumberFormat('en-IE', { style: 'currency', currency })
  const digits = format.resolvedOptions().maximumFractionDigits ?? 2
  return format.format(amountMinor / 10 ** digits)
}

/** Converts a price typed in major units (e.g. 0.85) to minor units for the currency (85). */
export function toMinorUnits(amountMajor: number, currency: string): number {
  const digits = new Intl.NumberFormat('en-IE', { style: 'currency', currency }).resolvedOptions().maximumFractionDigits ?? 2
  return Math.round(amountMajor * 10 ** digits)
}

/** The signed-in person's unit for lengths (account setting); millimetres outside a page or for visitors. */
export function currentLengthUnit(): LengthUnit {
  try {
    return useSessionStore().user?.lengthUnit ?? 'mm'
  } catch {
    return 'mm'
  }
}

/** A stored length (mm) in the reader's unit; read inside a render, so the page follows a change of unit. */
export function formatMm(value: number | null | undefined): string {
  return value === null || value === undefined ? '—' : formatLength(value, currentLengthUnit())
}

/** Why a material can't go on a cutter, with a thickness limit in the reader's unit. */
export function materialReason(material: { reason: string; tooThick?: boolean }, cutter: { maxThicknessMm?: number } | null | undefined): string {
  return material.tooThick && cutter?.maxThicknessMm !== undefined ? `Thicker than this cutter's ${formatMm(cutter.maxThicknessMm)} limit.` : material.reason
}

/** A stored width × height (mm) in the reader's unit. */
export function formatSizeMm(widthMm: number, heightMm: number): string {
  return formatSize(widthMm, heightMm, currentLengthUnit())
}

/** A whole cut path's length (mm) in the reader's unit: metres, or inches. */
export function formatPathMm(lengthMm: number): string {
  return formatPathLength(lengthMm, currentLengthUnit())
}

export function formatDate(iso: string | null | undefined): string {
  return iso ? new Date(iso.length === 10 ? `${iso}T12:00:00Z` : iso).toLocaleDateString('en-IE', { day: 'numeric', month: 'short', year: 'numeric' }) : '—'
}

export function formatDateTime(iso: string): string {
  return new Date(iso).toLocaleString('en-IE', { dateStyle: 'medium', timeStyle: 'short' })
}

/**
 * An instant shown as wall-clock time in the workshop's zone, e.g. "Thursday 3 Dec, 14:15". Luxon's
 * fixed pattern renders the same on the server and in every browser (Intl layouts differ between ICU versions).
 */
export function formatInZone(iso: string, timeZone: string, withDate = true): string {
  return DateTime.fromISO(iso, { zone: 'utc' }).setZone(timeZone).toFormat(withDate ? 'cccc d LLL, HH:mm' : 'HH:mm')
}
