// Production entry: connects to MariaDB, runs pending migrations, serves API and SPA.
import 'reflect-metadata'
import path from 'node:path'
import type { Server } from 'node:http'
import { loadConfig } from './config'
import { createDataSource } from './db/data-source'
import { createApp } from './app'
import { createMailService } from './mail'

export interface RunningServer {
  server: Server
  url: string
  stop(): Promise<void>
}

export async function startServer(env: NodeJS.ProcessEnv = process.env): Promise<RunningServer> {
  const config = loadConfig(env)
  const dataSource = createDataSource(config)
  await dataSource.initialize()
  await dataSource.runMigrations({ transaction: 'each' })
  const handle = createApp({ config, dataSource, clientDir: path.resolve(env.CLIENT_DIR ?? 'dist') })
  const server = await new Promise<Server>((resolve) => {
    const listening = handle.app.listen(config.PORT, config.HOST, () => resolve(listening))
  })
  const url = `http://${config.HOST}:${config.PORT}`
  // Every app process runs an outbox worker; SKIP LOCKED claims keep them from sending a row twice.
  const mail = createMailService(dataSource, config)
  mail.worker.start()
  // Hourly: issued quotes past their validity expire; buyers of quotes about to expire are reminded.
  const housekeeping = async () => {
    await handle.services.quotes.expireDue()
    await handle.services.quotes.sendExpiryReminders()
  }
  const timer = setInterval(() => void housekeeping().catch((error: unknown) => console.error('quote housekeeping failed', error)), 60 * 60 * 1000)
  timer.unref()
  void housekeeping().catch((error: unknown) => console.error('quote housekeeping failed', error))
  return {
    server,
    url,
    stop: async () => {
      clearInterval(timer)
      await new Promise<void>((resolve) => server.close(() => resolve()))
      server.closeAllConnections()
      await mail.stop()
      handle.close()
      await dataSource.destroy()
    },
  }
}
