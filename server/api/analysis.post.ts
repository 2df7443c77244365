import { countGroups } from '#shared/finding-groups'
import { analysisFieldsSchema } from '#shared/schemas/analysis'
import { withDefaults } from '../analysis/index'
import { analysisParamsFor } from '../services/analysis-profile'
import { fileEstimate } from '../services/jobs'

// Measures an uploaded SVG or DXF for a cutter × material from the catalog (or the default profile). With
// preview=1 the packed geometry and sites come along, gzip-compressed and base64-encoded, as nothing is stored.
export default defineApiHandler(async (event) => {
  const user = await requireUser(event)
  const upload = await readCutFileUpload(event)
  const input = analysisFieldsSchema.parse(upload.fields)
  const params =
    input.cutterId && input.materialId
      ? await analysisParamsFor(useDb(), { cutterId: input.cutterId, materialId: input.materialId, sheetId: input.sheetId })
      : withDefaults()
  if (input.dpi) params.dpi = input.dpi
  const { result, geometryGz, sitesGz } = await analyzeInWorker(upload.svgText, params, {
    ownerKey: analysisOwnerKey(user),
    format: upload.format,
    label: upload.filename,
    signal: upload.closed,
  })
  // Priced by the same function as a job of this one file (server/services/money.ts); no price without a cutter and material.
  const estimate =
    input.cutterId && input.materialId
      ? await fileEstimate(useDb(), { cutterId: input.cutterId, materialId: input.materialId, sheetId: input.sheetId }, result)
      : null
  const answer = {
    ...result,
    counts: countGroups(result.findingGroups),
    estimate: estimate && {
      billableMinutes: estimate.billableMinutes,
      machinePriceMinor: estimate.machinePriceMinor,
      sheetCount: estimate.sheetCount,
      materialPriceMinor: estimate.materialPriceMinor,
      totalPriceMinor: estimate.totalPriceMinor,
      currency: estimate.currency,
    },
  }
  if (input.preview !== '1') return answer
  return { ...answer, geometryGz: Buffer.from(geometryGz).toString('base64'), sitesGz: Buffer.from(sitesGz).toString('base64') }
})
