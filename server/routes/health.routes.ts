import type { DataSource } from 'typeorm'
import type { HealthResponse } from '../../shared/contracts/auth.contract'
import { ApiRouter } from '../http/api-router'

async function withTimeout<T>(promise: Promise<T>, ms: number): Promise<T> {
  let timer: NodeJS.Timeout | undefined
  const timeout = new Promise<never>((_resolve, reject) => {
    timer = setTimeout(() => reject(new Error(`no answer within ${ms} ms`)), ms)
  })
  try {
    return await Promise.race([promise, timeout])
  } finally {
    clearTimeout(timer)
  }
}

export function healthRoutes(dataSource: DataSource): ApiRouter {
  const api = new ApiRouter()
  api.get('/health', 'public', async (_req, res) => {
    try {
      await withTimeout(dataSource.query('SELECT 1'), 3000)
      const body: HealthResponse = { status: 'ok', database: 'ok' }
      res.json(body)
    } catch (error) {
      const reason = error instanceof Error ? error.message : String(error)
      const body: HealthResponse = { status: 'error', database: 'unreachable', reason: `database: ${reason}` }
      res.status(503).json(body)
    }
  })
  return api
}
