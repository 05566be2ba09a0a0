// Prepares the API tests' database: the throwaway MariaDB of `npm test` (TEST_DB_* set), or one of
// its own when the suite runs alone (`npm run test:api`). The schema comes from the migrations.
import path from 'node:path'
import { rmSync } from 'node:fs'
import mysql from 'mysql2/promise'
import type { TestProject } from 'vitest/node'
import { startMaria, type MariaInstance } from '../../scripts/lib/mariadb'
import { freePort } from '../../scripts/lib/services'
import { createDataSource } from '../../server/db/data-source'

export interface TestDatabase {
  host: string
  port: number
  password: string
  socket: string
  database: string
}

declare module 'vitest' {
  export interface ProvidedContext {
    testDatabase: TestDatabase
  }
}

let own: MariaInstance | undefined
// A folder of this run's own, so parallel runs never touch each other's server.
const ownDir = path.resolve(`.data/test-api-${process.pid}/mariadb`)

export async function setup(project: TestProject): Promise<void> {
  let port = Number(process.env.TEST_DB_PORT ?? 0)
  let socket = process.env.TEST_DB_SOCKET ?? ''
  const password = process.env.TEST_DB_PASSWORD ?? 'spinwright-test'
  const database = 'spinwright_test'
  if (!port) {
    own = await startMaria({ dir: ownDir, port: await freePort(3337), database, user: 'spinwright', password })
    port = own.port
    socket = own.socket
  }
  const root = await mysql.createConnection({ socketPath: socket, user: 'root', password: '' })
  try {
    await root.query(`DROP DATABASE IF EXISTS \`${database}\``)
    await root.query(`CREATE DATABASE \`${database}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`)
    await root.query(`GRANT ALL PRIVILEGES ON *.* TO 'spinwright'@'127.0.0.1' WITH GRANT OPTION`)
  } finally {
    await root.end()
  }
  const dataSource = createDataSource({ DB_HOST: '127.0.0.1', DB_PORT: port, DB_NAME: database, DB_USER: 'spinwright', DB_PASSWORD: password })
  await dataSource.initialize()
  await dataSource.runMigrations({ transaction: 'each' })
  await dataSource.destroy()
  project.provide('testDatabase', { host: '127.0.0.1', port, password, socket, database })
}

export async function teardown(): Promise<void> {
  await own?.stop()
  if (own) rmSync(path.dirname(ownDir), { recursive: true, force: true })
}
