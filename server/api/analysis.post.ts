import { analysisFieldsSchema } from '#shared/schemas/analysis'
import { withDefaults } from '../analysis/index'
import { analysisParamsFor } from '../services/analysis-profile'

// Measures an uploaded SVG for a cutter × material from the catalog (or the default profile).
export default defineApiHandler(async (event) => {
  await requireUser(event)
  const upload = await readCutFileUpload(event)
  const input = analysisFieldsSchema.parse(upload.fields)
  const params =
    input.cutterId && input.materialId
      ? await analysisParamsFor(useDb(), { cutterId: input.cutterId, materialId: input.materialId, sheetId: input.sheetId })
      : withDefaults()
  if (input.dpi) params.dpi = input.dpi
  return analyzeInWorker(upload.svgText, params, { includeContours: input.preview === '1' })
})
