// Child process for the kill test: commits one import batch and says when it starts.
// Usage: tsx tests/api/commit-import-batch.ts <batchId> <userId>  (DB_* in the environment)
import 'reflect-metadata'
import { createDataSource } from '../../server/db/data-source'
import { User } from '../../server/db/entities'
import { CatalogueImportService } from '../../server/imports/catalogue-import.service'
import { toSessionUser } from '../../server/services/user.service'

const [batchId = '', userId = ''] = process.argv.slice(2)
const dataSource = createDataSource({
  DB_HOST: '127.0.0.1',
  DB_PORT: Number(process.env.DB_PORT),
  DB_NAME: process.env.DB_NAME ?? '',
  DB_USER: 'spinwright',
  DB_PASSWORD: process.env.DB_PASSWORD ?? '',
})
await dataSource.initialize()
const user = toSessionUser(await dataSource.getRepository(User).findOneOrFail({ where: { id: userId }, relations: { organisation: true } }))
console.log('committing')
await new CatalogueImportService(dataSource).commit(batchId, user)
console.log('done')
await dataSource.destroy()
