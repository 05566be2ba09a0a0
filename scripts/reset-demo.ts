// `npm run db:reset`: drops the demo database (the next `npm start` migrates and seeds it afresh).
// Stop the app first. Uploaded files, PDFs and captured mail under .data are cleared too.
import path from 'node:path'
import { rmSync } from 'node:fs'
import { recreateDatabase, startMaria } from './lib/mariadb'
import { fail, say } from './lib/log'

async function main(): Promise<void> {
  const dataDir = path.resolve(process.env.DATA_DIR ?? '.data')
  const maria = await startMaria({ dir: path.join(dataDir, 'mariadb'), port: Number(process.env.DB_PORT ?? 3307), database: 'spinwright', user: 'spinwright', password: process.env.DB_PASSWORD ?? 'spinwright-local' })
  try {
    await recreateDatabase(maria.socket, process.env.DB_NAME ?? 'spinwright')
    for (const folder of ['quotes', 'datasheets', 'mailbox', 'imports']) rmSync(path.join(dataDir, folder), { recursive: true, force: true })
    say('demo database dropped; `npm start` seeds it again')
  } finally {
    await maria.stop()
  }
}

main().catch((error: unknown) => fail(error instanceof Error ? error.message : String(error)))
