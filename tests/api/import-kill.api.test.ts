// The app killed in the middle of an import commit: what was committed stays, nothing partial is
// applied. A child process commits a large batch and is killed with SIGKILL part-way, once a
// connection reading uncommitted data has seen some of the batch's rows written.
import { spawn } from 'node:child_process'
import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { Like } from 'typeorm'
import { ImportBatch, MotorVariant } from '../../server/db/entities'
import { csvOf, variantRow } from './catalogue-csv-fixtures'
import { createUser, signInAs, startTestApp, type SignedInAgent, type TestContext } from './support'

let ctx: TestContext
let admin: SignedInAgent

beforeAll(async () => {
  ctx = await startTestApp()
  admin = await signInAs(ctx, await createUser(ctx.dataSource, 'admin'))
})
afterAll(async () => {
  await ctx.close()
})

function csv(family: string, count: number): string {
  const rows = Array.from({ length: count }, (_, index) =>
    variantRow(family, `${family}-${String(index).padStart(5, '0')}`, {
      family_name: `Kill test family ${family}`,
      family_description: 'Invented rows for the kill test',
      name: `Kill test motor ${index}`,
      rated_output_w: String(5 + (index % 20)),
    }),
  )
  return csvOf(rows)
}

describe('an import commit killed part-way', () => {
  it('applies none of the rows of a commit killed part-way, and the same batch commits fully afterwards', async () => {
    const family = `K${randomUUID().slice(0, 6).toUpperCase()}`
    const rows = 8000
    const preview = await admin.agent.post('/api/admin/catalogue/import').set('X-CSRF-Token', admin.csrf).attach('file', Buffer.from(csv(family, rows)), 'kill.csv')
    expect(preview.status).toBe(201)
    const batchId: string = preview.body.batchId
    expect(batchId).toBeTruthy()

    // Node itself with tsx as its loader: the tsx command would run the script in a grandchild
    // that outlives a SIGKILL sent to the command.
    const child = spawn(process.execPath, ['--import', 'tsx', 'tests/api/commit-import-batch.ts', batchId, admin.user.id], {
      env: { ...process.env, TSX_TSCONFIG_PATH: 'tsconfig.server.json', DB_PORT: String(ctx.config.DB_PORT), DB_NAME: ctx.config.DB_NAME, DB_PASSWORD: ctx.config.DB_PASSWORD },
      stdio: ['ignore', 'pipe', 'pipe'],
    })
    let output = ''
    const exited = new Promise<NodeJS.Signals | number | null>((resolve) => child.on('exit', (code, signal) => resolve(signal ?? code)))
    await new Promise<void>((resolve, reject) => {
      const timer = setTimeout(() => reject(new Error(`child never started committing: ${output}`)), 60_000)
      child.stdout.on('data', (chunk: Buffer) => {
        output += chunk.toString()
        if (output.includes('committing')) {
          clearTimeout(timer)
          resolve()
        }
      })
      child.stderr.on('data', (chunk: Buffer) => {
        output += chunk.toString()
      })
    })
    // Pull the plug while the transaction is under way: a connection reading uncommitted data
    // (READ UNCOMMITTED) sees the commit's rows appear; kill as soon as some but not all are in.
    const watcher = ctx.dataSource.createQueryRunner()
    await watcher.connect()
    let seenMidway = 0
    try {
      await watcher.query('SET SESSION TRANSACTION ISOLATION LEVEL READ UNCOMMITTED')
      const deadline = Date.now() + 60_000
      while (Date.now() < deadline) {
        const [row] = (await watcher.query('SELECT COUNT(*) AS n FROM motor_variant WHERE partNumber LIKE ?', [`${family}-%`])) as { n: string | number }[]
        const n = Number(row?.n ?? 0)
        if (n > 0 && n < rows) {
          seenMidway = n
          break
        }
        if (n >= rows) break
        await new Promise((resolve) => setTimeout(resolve, 2))
      }
    } finally {
      child.kill('SIGKILL')
      await watcher.release()
    }
    const ended = await exited
    expect(ended, output).toBe('SIGKILL')
    // The kill landed mid-transaction: some rows were written, uncommitted, when it came.
    expect(seenMidway, 'the watcher never saw the commit part-way (it finished or never wrote)').toBeGreaterThan(0)

    // The server finishes or rolls back the dead client's transaction on its own; the batch's
    // row lock is free again once it has. Then the batch state and the rows must agree.
    const variants = ctx.dataSource.getRepository(MotorVariant)
    const batches = ctx.dataSource.getRepository(ImportBatch)
    let batch = await batches.findOneByOrFail({ id: batchId })
    await ctx.dataSource.transaction(async (manager) => {
      batch = await manager.findOneOrFail(ImportBatch, { where: { id: batchId }, lock: { mode: 'pessimistic_write' } })
    })
    const afterKill = await variants.countBy({ partNumber: Like(`${family}-%`) })
    // Killed part-way: the server rolled the dead client's transaction back; nothing of it stays.
    expect(afterKill).toBe(0)
    expect(batch.status).not.toBe('committed')

    const commit = await admin.agent.post(`/api/admin/catalogue/import/batches/${batchId}/commit`).set('X-CSRF-Token', admin.csrf).send({})
    expect(commit.status, JSON.stringify(commit.body)).toBe(200)
    expect(await variants.countBy({ partNumber: Like(`${family}-%`) })).toBe(rows)
  }, 180_000)
})
