import type { Cutter } from './catalog/cutters'
import { applyCorrection } from './calibration/index'
import { priceCut } from './money'
import type { JobTimeCorrection } from './time-calibration'
import type { RevisionFigures } from './revision-summary'
import { layoutSheets, type JobSheets } from './sheet-layout'

export interface EstimatedFile {
  fileId: number
  quantity: number
  /** The revision's summary columns: time, lengths, box. */
  figures: Pick<RevisionFigures, 'time' | 'cut' | 'bbox'>
}

export interface JobEstimate {
  /** The time model's parts over all copies (cut includes score and engrave), for calibration. */
  components: { cutS: number; pierceS: number; travelS: number; setupS: number }
  cutLengthMm: number
  pierces: number
  /** Machine time for every copy of every file plus one setup. */
  machineS: number
  billableMinutes: number
  machinePriceMinor: number
  sheetCount: number
  sheetPriceMinor: number
  materialPriceMinor: number
  totalPriceMinor: number
  currency: string
  layout: JobSheets
  /** The learnt correction applied to the machine time, or null while too few jobs are finished. */
  calibration: Pick<JobTimeCorrection, 'calibratedOn' | 'scope' | 'holdOut' | 'coefficients'> | null
  /** The time model's own figure, before any correction. */
  modelMachineS: number
}

// Spacing between parts on a sheet on top of the kerf (common practice, no source).
export const PART_GAP_MM = 2
export const SHEET_MARGIN_MM = 5

/**
 * The job's totals: machine time summed over copies plus one setup per job, and its price by `priceCut`
 * (money.ts) with whole stock sheets from the layout. Money in integer minor units.
 */
export function estimateJob(
  files: EstimatedFile[],
  cutter: Pick<Cutter, 'setupMinutes' | 'billingIncrementMinutes' | 'pricePerMinuteMinor' | 'currency'>,
  sheet: { widthMm: number; heightMm: number; priceMinor: number },
  kerfMm: number,
  correction: JobTimeCorrection | null = null,
): JobEstimate {
  const setupS = cutter.setupMinutes * 60
  let machineS = files.length > 0 ? setupS : 0
  let cutLengthMm = 0
  let pierces = 0
  const components = { cutS: 0, pierceS: 0, travelS: 0, setupS: files.length > 0 ? setupS : 0 }
  for (const file of files) {
    const time = file.figures.time
    machineS += (time.totalS - time.setupS) * file.quantity
    components.cutS += (time.cutS + time.scoreS + time.engraveS) * file.quantity
    components.pierceS += time.pierceS * file.quantity
    components.travelS += time.travelS * file.quantity
    cutLengthMm += file.figures.cut.lengthMm * file.quantity
    pierces += file.figures.cut.pierces * file.quantity
  }
  const modelMachineS = machineS
  if (correction && files.length > 0) machineS = applyCorrection(components, correction.coefficients)
  const layout = layoutSheets(
    files.map((f) => ({ fileId: f.fileId, widthMm: f.figures.bbox.width, heightMm: f.figures.bbox.height, quantity: f.quantity })),
    sheet,
    kerfMm + PART_GAP_MM,
    SHEET_MARGIN_MM,
  )
  const price =
    files.length > 0
      ? priceCut({
          cutMinutes: (machineS - setupS) / 60,
          incrementMinutes: cutter.billingIncrementMinutes,
          setupMinutes: cutter.setupMinutes,
          ratePerMinuteMinor: cutter.pricePerMinuteMinor,
          sheetCount: layout.sheets.length,
          sheetPriceMinor: sheet.priceMinor,
        })
      : { billableMinutes: 0, machinePriceMinor: 0, materialPriceMinor: 0, totalPriceMinor: 0 }
  return {
    components,
    modelMachineS,
    calibration: correction
      ? { calibratedOn: correction.calibratedOn, scope: correction.scope, holdOut: correction.holdOut, coefficients: correction.coefficients }
      : null,
    cutLengthMm,
    pierces,
    machineS,
    ...price,
    sheetCount: layout.sheets.length,
    sheetPriceMinor: sheet.priceMinor,
    currency: cutter.currency,
    layout,
  }
}
