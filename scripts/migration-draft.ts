// Developer aid: prints the SQL that would bring a database migrated to the latest committed
// migration in line with the entities. Paste it into a new migration after reading it.
// Usage: npm run migration:draft  (needs the start instance running, or DB_* pointing at a scratch db)
import { createDataSource } from '../server/db/data-source'
import { loadConfig } from '../server/config'

const config = loadConfig({ SESSION_SECRET: 'x'.repeat(32), ...process.env })
const dataSource = createDataSource({ ...config, DB_NAME: process.env.DRAFT_DB_NAME ?? 'spinwright_draft' })
await dataSource.initialize()
await dataSource.runMigrations()
const log = await dataSource.driver.createSchemaBuilder().log()
for (const query of log.upQueries) console.log(`${query.query};`)
if (log.upQueries.length === 0) console.log('-- entities and migrations agree')
await dataSource.destroy()
