import type { CutterKind, MaterialFamily } from './catalog'

// The cautions the trade treats as non-negotiable. Common practice, no source: they are
// reminders, not a safety assessment.
export const SAFETY_DEFERRAL =
  "Your workshop's safety officer, local codes and the machine maker's manual have the final word."

export interface Caution {
  code: string
  title: string
  text: string
}

export const LASER_NEVER_MATERIALS: Caution = {
  code: 'laser-chlorine',
  title: 'Never in a laser: PVC, vinyl and other chlorine-bearing plastics',
  text: 'PVC, vinyl and some faux leathers release chlorine compounds when lasered: corrosive to the machine and toxic to breathe. They must never go in a laser.',
}

export const LASER_POOR_PLASTICS: Caution = {
  code: 'laser-poly-abs',
  title: 'Polycarbonate and ABS on a CO₂ laser',
  text: 'Polycarbonate and ABS cut badly on a CO₂ laser, discolour and catch fire easily, and give off harmful fumes.',
}

export const LASER_ATTENDED: Caution = {
  code: 'laser-fire-watch',
  title: 'Lid closed, someone watching',
  text: 'Keep the lid closed and stay with the machine for the whole cut: lasers set material alight. Know where the extinguisher is.',
}

export const PLASMA_EYES_TABLE: Caution = {
  code: 'plasma-eyes-table',
  title: 'Eye protection and a clear, dry table',
  text: 'The plasma arc damages eyes: wear shaded eye protection. Keep the table clear of anything flammable and free of standing water.',
}

export const COATED_STEEL_FUME: Caution = {
  code: 'coated-steel-fume',
  title: 'Galvanised or coated steel gives off zinc and coating fumes',
  text: 'Cutting galvanised or coated steel releases zinc oxide and coating fumes: run the fume extraction and wear a suitable respirator.',
}

export const FUME_EXTRACTION: Caution = {
  code: 'fume-extraction',
  title: 'Fume extraction on',
  text: 'Every cut makes fume and smoke: check the extraction is running before you start.',
}

/** The cautions to show for a cutter kind, and for a material on it (by family and its own hazard note). */
export function cautionsFor(kind: CutterKind, material?: { family: MaterialFamily; name: string }): Caution[] {
  const cautions: Caution[] = [FUME_EXTRACTION]
  if (kind === 'co2-laser' || kind === 'fiber-laser') cautions.push(LASER_ATTENDED, LASER_NEVER_MATERIALS)
  if (kind === 'co2-laser') cautions.push(LASER_POOR_PLASTICS)
  if (kind === 'plasma') cautions.push(PLASMA_EYES_TABLE)
  if (material && /galvani[sz]ed|coated|zinc/i.test(material.name)) cautions.push(COATED_STEEL_FUME)
  return cautions
}
