// `npm start`: the whole product on one machine. MariaDB (project-local), the local mail and
// payment fakes, migrations, demo seed, the built SPA and the API in one Express process.
import path from 'node:path'
import { existsSync } from 'node:fs'
import { startMaria } from './lib/mariadb'
import { fail, say } from './lib/log'
import { localEnvironment } from './lib/environment'
import { buildClientIfStale, onShutdown, startFakes, type FakeServices } from './lib/services'
import { DEMO_PASSWORD, DEMO_USERS } from '../server/seed/demo-users'

const dataDir = path.resolve(process.env.DATA_DIR ?? '.data')
const ports = {
  app: Number(process.env.PORT ?? 8080),
  db: Number(process.env.DB_PORT ?? 3307),
  smtp: Number(process.env.MAIL_SMTP_PORT ?? 2525),
  mailbox: Number(process.env.MAIL_HTTP_PORT ?? 2580),
  payments: Number(process.env.PAY_PORT ?? 12111),
}

async function main(): Promise<void> {
  const env = localEnvironment(dataDir, ports, process.env.DB_NAME ?? 'spinwright')
  const maria = await startMaria({
    dir: path.join(dataDir, 'mariadb'),
    port: ports.db,
    database: env.DB_NAME ?? 'spinwright',
    user: env.DB_USER ?? 'spinwright',
    password: env.DB_PASSWORD ?? '',
  })
  say(`MariaDB ready on 127.0.0.1:${maria.port} (pid ${maria.pid})`)
  let fakes: FakeServices | undefined
  let stopServer: (() => Promise<void>) | undefined
  onShutdown(async () => {
    await stopServer?.()
    await fakes?.stop()
    await maria.stop()
    say('stopped')
  })

  try {
    Object.assign(process.env, env)
    if (existsSync('server/fakes/main.ts')) {
      fakes = await startFakes(env)
      say(`local fakes ready: SMTP 127.0.0.1:${ports.smtp}, mailbox API :${ports.mailbox}, payment API :${ports.payments}`)
    }
    const { startServer } = await import('../server/index')
    const { prepareDatabase } = await import('../server/db/prepare')
    const seeded = await prepareDatabase(env)
    if (seeded.length > 0) say(`seeded demo data: ${seeded.join(', ')}`)
    buildClientIfStale()
    const running = await startServer(env)
    stopServer = running.stop
    say(`Spinwright is running at ${running.url}`)
    say('demo sign-ins (password ' + DEMO_PASSWORD + '):')
    for (const user of DEMO_USERS) say(`  ${user.role.padEnd(6)} ${user.email}`)
    say('press Ctrl-C to stop')
  } catch (error) {
    await stopServer?.()
    await fakes?.stop()
    await maria.stop()
    throw error
  }
}

main().catch((error: unknown) => fail(error instanceof Error ? error.message : String(error)))
