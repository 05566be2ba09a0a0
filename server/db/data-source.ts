import 'reflect-metadata'
import { DataSource } from 'typeorm'
import type { Config } from '../config'
import { entities } from './entities'
import { migrations } from './migrations'

export type DatabaseSettings = Pick<Config, 'DB_HOST' | 'DB_PORT' | 'DB_NAME' | 'DB_USER' | 'DB_PASSWORD'>

export function createDataSource(settings: DatabaseSettings): DataSource {
  return new DataSource({
    type: 'mariadb',
    host: settings.DB_HOST,
    port: settings.DB_PORT,
    database: settings.DB_NAME,
    username: settings.DB_USER,
    password: settings.DB_PASSWORD,
    charset: 'utf8mb4_unicode_ci',
    timezone: 'Z',
    entities,
    migrations,
    migrationsTableName: 'schema_migration',
    synchronize: false,
    logging: ['error'],
    // Fail fast when the server is gone instead of queueing requests forever.
    connectTimeout: 5000,
    poolSize: 20,
    extra: { connectionLimit: 20, enableKeepAlive: true, maxIdle: 10, idleTimeout: 60_000 },
  })
}
