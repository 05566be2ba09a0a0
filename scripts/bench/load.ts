// Part "load": autocannon against the app on loopback, 32 connections per route, the health route
// (one SELECT 1 through the pool) as the floor. Latency percentiles come from every response.
import autocannon, { type Options } from 'autocannon'
import { z } from 'zod'
import type { BenchStack } from './stack'
import { anonymousSession, jsonHeaders } from './http'
import { rangeHoodStudy } from './selection'
import { VARIANT_SORT_KEYS } from '../../shared/contracts/catalogue.contract'
import { check, emit, percentile, round } from './report'

interface LoadFigures {
  requestsPerSecond: number
  requests: number
  p50Ms: number
  p95Ms: number
  p99Ms: number
  maxMs: number
  errors: number
  timeouts: number
  non2xx: number
}

function runAutocannon(options: Options): Promise<LoadFigures> {
  return new Promise((resolve, reject) => {
    const latencies: number[] = []
    const instance = autocannon(options, (error, result) => {
      if (error) {
        reject(error)
        return
      }
      resolve({
        requestsPerSecond: round(latencies.length / result.duration, 1),
        requests: latencies.length,
        p50Ms: round(percentile(latencies, 50)),
        p95Ms: round(percentile(latencies, 95)),
        p99Ms: round(percentile(latencies, 99)),
        maxMs: round(Math.max(...latencies)),
        errors: result.errors,
        timeouts: result.timeouts,
        non2xx: result.non2xx,
      })
    })
    instance.on('response', (_client, _status, _bytes, responseTime) => {
      latencies.push(responseTime)
    })
  })
}

const listSchema = z.object({ items: z.array(z.object({ partNumber: z.string() })).min(1), total: z.number() })

export async function benchLoad(stack: BenchStack, quick: boolean): Promise<void> {
  const duration = quick ? 5 : 20
  const connections = 32
  const listPath = '/api/v1/catalogue/variants?page=1&pageSize=25&sort=ratedOutputW'
  const list = listSchema.parse(await (await fetch(`${stack.baseUrl}${listPath}`)).json())
  const partNumber = list.items[0]?.partNumber ?? ''
  const session = await anonymousSession(stack.baseUrl)
  const studyBody = JSON.stringify({ input: rangeHoodStudy() })
  // Warm the app's catalogue cache so the study route's first request is not a cold load.
  await fetch(`${stack.baseUrl}/api/v1/studies/preview-run`, { method: 'POST', headers: jsonHeaders(session), body: studyBody })

  // A different list query on nearly every request (page size, sort, order, page, minimum output),
  // so the answer cache misses: the cost of a query nobody asked for in the last while.
  let varied = 0
  const sorts = VARIANT_SORT_KEYS
  const variedPath = (): string => {
    const n = varied++
    const pageSize = 10 + (n % 91)
    const sort = sorts[Math.floor(n / 91) % sorts.length] ?? 'partNumber'
    const order = Math.floor(n / (91 * sorts.length)) % 2 === 0 ? 'asc' : 'desc'
    const minOutputW = Math.floor(n / (182 * sorts.length)) % 60
    return `/api/v1/catalogue/variants?page=1&pageSize=${pageSize}&sort=${sort}&order=${order}&minOutputW=${minOutputW}`
  }

  const targets: Array<{ name: string; options: Options }> = [
    { name: 'GET /api/health', options: { url: `${stack.baseUrl}/api/health` } },
    { name: 'GET catalogue list (25, by output)', options: { url: `${stack.baseUrl}${listPath}` } },
    {
      name: 'GET catalogue list, a new query each time (uncached)',
      options: { url: `${stack.baseUrl}${listPath}`, requests: [{ setupRequest: (request) => ({ ...request, path: variedPath() }) }] },
    },
    { name: `GET variant ${partNumber}`, options: { url: `${stack.baseUrl}/api/v1/catalogue/variants/${encodeURIComponent(partNumber)}` } },
    { name: 'POST preview-run (demo catalogue)', options: { url: `${stack.baseUrl}/api/v1/studies/preview-run`, method: 'POST', headers: jsonHeaders(session), body: studyBody } },
  ]
  for (const target of targets) {
    // One connection first: the latency a lone user sees, without queueing behind 31 others.
    const alone = await runAutocannon({ ...target.options, connections: 1, duration: quick ? 3 : 5, timeout: 10 })
    emit('load', { route: target.name, connections: 1, durationS: quick ? 3 : 5, catalogueVariants: list.total, ...alone })
    const figures = await runAutocannon({ ...target.options, connections, duration, timeout: 10 })
    emit('load', { route: target.name, connections, durationS: duration, catalogueVariants: list.total, ...figures })
    const clean = figures.errors === 0 && figures.non2xx === 0 && figures.timeouts === 0
    const value = `${figures.requestsPerSecond} req/s, p95 ${figures.p95Ms} ms`
    check(`load: ${target.name} @1`, `${alone.requestsPerSecond} req/s, p50 ${alone.p50Ms} ms`, 'informational', undefined)
    if (target.name.startsWith('GET catalogue list (')) check(`load: ${target.name} p95 @${connections}`, value, '< 50 ms p95, 0 errors', figures.p95Ms < 50 && clean)
    else check(`load: ${target.name} @${connections}`, value, '0 errors / non-2xx', clean)
    await new Promise((resolve) => setTimeout(resolve, 1000))
  }
}
