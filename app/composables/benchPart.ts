import type { Component } from '#shared/circuit/schema'

/** One part of the Bench's document, as a node component sees it. */
export function useBenchPart<K extends Component['kind']>(id: string, _kind?: K) {
  const bench = useBenchStore()
  const part = computed(() => bench.doc.components.find((c) => c.id === id) as Extract<Component, { kind: K }> | undefined)
  const flagged = computed<'danger' | 'caution' | null>(() => {
    // the hazards of this state, and the cautions about energizing (a device that may open on inrush)
    const hazards = [...(bench.result?.hazards ?? []), ...(bench.result?.cautions ?? [])].filter((h) => h.units.includes(id))
    if (hazards.some((h) => h.severity === 'danger')) return 'danger'
    return hazards.length ? 'caution' : null
  })
  return { bench, part, flagged }
}
