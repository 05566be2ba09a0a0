// The invented demo catalogue in the solver's form, without a database: for the selection specs
// and the compute-only selection benchmark (the server builds the same from its tables).
import { preparePerformance, type CatalogueEntry } from '../../shared/selection/run-selection'
import { generateDemoCatalogue } from './demo-catalogue'

export function demoCatalogueEntries(): CatalogueEntry[] {
  const catalogue = generateDemoCatalogue()
  const byPart = new Map<string, CatalogueEntry>()
  for (const variant of catalogue.variants) {
    const family = catalogue.families.find((item) => item.code === variant.familyCode)
    byPart.set(variant.partNumber, {
      variantId: variant.partNumber,
      partNumber: variant.partNumber,
      name: variant.name,
      type: family?.type ?? 'psc',
      poles: variant.poles,
      ratedOutputW: variant.ratedOutputW,
      frameDiameterMm: variant.frameDiameterMm,
      mounting: variant.mounting,
      enclosure: variant.enclosure,
      rotation: variant.rotation,
      rotationViewedFrom: variant.rotationViewedFrom,
      otherRotationAvailable: variant.otherRotationAvailable,
      insulationClass: variant.insulationClass,
      protection: variant.protection,
      maxAmbientC: variant.maxAmbientC,
      lifecycle: variant.lifecycle,
      performance: [],
    })
  }
  for (const row of catalogue.performance) {
    const entry = byPart.get(row.partNumber)
    if (!entry) continue
    const id = `${row.partNumber}/${row.tap}/${row.volts}/${row.hz}`
    entry.performance.push(preparePerformance({ id, tap: row.tap, volts: row.volts, hz: row.hz, referenceTempC: row.referenceTempC, motor: row.motor }, entry.insulationClass))
  }
  return [...byPart.values()]
}
