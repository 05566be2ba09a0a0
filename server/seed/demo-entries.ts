// The invented demo catalogue in the solver's form, without a database: for the selection specs
// and the compute-only selection benchmark (the server builds the same from its tables).
import { catalogueSource, prepareEntry, type CatalogueEntry, type CatalogueSource } from '../../shared/selection/run-selection'
import { generateDemoCatalogue } from './demo-catalogue'

export function demoCatalogueEntries(): CatalogueEntry[] {
  const catalogue = generateDemoCatalogue()
  const byPart = new Map<string, CatalogueSource>()
  for (const variant of catalogue.variants) {
    const family = catalogue.families.find((item) => item.code === variant.familyCode)
    byPart.set(variant.partNumber, catalogueSource(variant.partNumber, variant, family?.type ?? 'psc', variant.insulationClass))
  }
  for (const row of catalogue.performance) {
    const id = `${row.partNumber}/${row.tap}/${row.volts}/${row.hz}`
    byPart.get(row.partNumber)?.performance.push({ id, tap: row.tap, volts: row.volts, hz: row.hz, referenceTempC: row.referenceTempC, motor: row.motor })
  }
  // Demo data the core refuses is a bug in the generator: fail loudly rather than leave it out.
  return [...byPart.values()].map((source) =>
    prepareEntry(source, (row, error) => {
      throw new Error(`demo performance ${row.id} refused: ${error instanceof Error ? error.message : String(error)}`)
    }),
  )
}
