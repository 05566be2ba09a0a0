// Brings a database to the latest schema and seeds the demo data once.
import { loadConfig } from '../config'
import { seedDemoData } from '../seed'
import { createDataSource } from './data-source'

export async function prepareDatabase(env: NodeJS.ProcessEnv, options: { seed?: boolean } = {}): Promise<string[]> {
  const dataSource = createDataSource(loadConfig(env))
  await dataSource.initialize()
  try {
    await dataSource.runMigrations({ transaction: 'each' })
    return options.seed === false ? [] : await seedDemoData(dataSource)
  } finally {
    await dataSource.destroy()
  }
}
