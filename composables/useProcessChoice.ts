/** What the choice reads of a cutter in GET /api/catalog/overview. */
interface ChoosableCutter {
  cutterId: number
  materials: { materialId: number; cuttable: boolean }[]
}

/**
 * The cutter × material a member picks for a file or a job. The material falls back to the first one
 * that can be cut on the chosen cutter — a computed rather than a watcher, so the server renders the
 * same choice the browser starts with.
 */
export function useProcessChoice<Cutter extends ChoosableCutter>(cutters: Ref<Cutter[]>) {
  const chosenCutterId = ref<number | null>(null)
  const chosenMaterialId = ref<number | null>(null)

  const cutterId = computed({
    get: () => chosenCutterId.value ?? cutters.value[0]?.cutterId ?? null,
    set: (id: number | null) => (chosenCutterId.value = id),
  })
  const cutter = computed(() => cutters.value.find((c) => c.cutterId === cutterId.value))
  const materialId = computed({
    get: () => {
      const materials = cutter.value?.materials ?? []
      const chosenIsCuttable = materials.some((m) => m.materialId === chosenMaterialId.value && m.cuttable)
      return chosenIsCuttable ? chosenMaterialId.value : (materials.find((m) => m.cuttable)?.materialId ?? null)
    },
    set: (id: number | null) => (chosenMaterialId.value = id),
  })
  return { cutterId, materialId, cutter }
}
