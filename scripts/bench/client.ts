// Part "client": the built SPA's first-screen JavaScript and CSS (gzipped with node:zlib, as a
// compressing proxy would send them) and the time to the catalogue's first rendered row in
// headless Chromium on loopback (median of cold page loads, each in a fresh browser context).
import { existsSync, readFileSync, readdirSync } from 'node:fs'
import path from 'node:path'
import { gzipSync } from 'node:zlib'
import { chromium } from '@playwright/test'
import type { BenchStack } from './stack'
import { check, emit, median, round } from './report'

const CHROMIUM_FLAGS = ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run']
/** A catalogue row's part-number link (CatalogueView.vue): the row is on screen with its data. */
const FIRST_ROW = '[data-test="catalogue-table"] a[data-test^="variant-link-"]'

const gzipKb = (file: string) => gzipSync(readFileSync(file), { level: 9 }).length / 1024
const rawKb = (file: string) => readFileSync(file).length / 1024

/** The assets index.html loads before any route chunk: entry script, module preloads, stylesheets. */
export function initialAssets(clientDir: string): { js: string[]; css: string[] } {
  const html = readFileSync(path.join(clientDir, 'index.html'), 'utf8')
  const attr = (tag: string, name: string) => new RegExp(`${name}="([^"]+)"`).exec(tag)?.[1]
  const js = new Set<string>()
  const css = new Set<string>()
  for (const tag of html.match(/<script\b[^>]*>/g) ?? []) {
    const src = attr(tag, 'src')
    if (src && /type="module"/.test(tag)) js.add(src)
  }
  for (const tag of html.match(/<link\b[^>]*>/g) ?? []) {
    const href = attr(tag, 'href')
    const rel = attr(tag, 'rel')
    if (!href) continue
    if (rel === 'modulepreload') js.add(href)
    if (rel === 'stylesheet') css.add(href)
  }
  const local = (url: string) => path.join(clientDir, url.replace(/^\//, ''))
  return { js: [...js].map(local), css: [...css].map(local) }
}

function bundleSizes(clientDir: string): void {
  const { js, css } = initialAssets(clientDir)
  const jsKb = js.reduce((sum, file) => sum + gzipKb(file), 0)
  const cssKb = css.reduce((sum, file) => sum + gzipKb(file), 0)
  const assets = path.join(clientDir, 'assets')
  const allJs = existsSync(assets) ? readdirSync(assets).filter((name) => name.endsWith('.js')) : []
  const initialNames = new Set(js.map((file) => path.basename(file)))
  const lazy = allJs.filter((name) => !initialNames.has(name))
  const lazyKb = lazy.reduce((sum, name) => sum + gzipKb(path.join(assets, name)), 0)
  emit('client-bundle', {
    initialJsGzipKb: round(jsKb, 1),
    initialJsRawKb: round(js.reduce((sum, file) => sum + rawKb(file), 0), 1),
    initialCssGzipKb: round(cssKb, 1),
    initialCssRawKb: round(css.reduce((sum, file) => sum + rawKb(file), 0), 1),
    initialJsFiles: js.map((file) => path.basename(file)),
    initialCssFiles: css.map((file) => path.basename(file)),
    lazyJsChunks: lazy.length,
    lazyJsGzipKb: round(lazyKb, 1),
  })
  check('client: first-screen JS (gzip)', `${round(jsKb, 1)} KB (+ ${round(cssKb, 1)} KB CSS)`, '< 300 KB, routes lazy', jsKb < 300 && lazy.length > 0)
}

async function firstRow(stack: BenchStack, clientDir: string, loads: number): Promise<void> {
  const executablePath = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium'
  const browser = await chromium.launch({ executablePath, headless: true, args: CHROMIUM_FLAGS })
  try {
    const samples: number[] = []
    let jsKb = 0
    for (let i = 0; i < loads; i += 1) {
      // A fresh context has an empty cache: every load is cold.
      const context = await browser.newContext({ viewport: { width: 1366, height: 900 } })
      const page = await context.newPage()
      const problems: string[] = []
      page.on('console', (message) => {
        if (message.type() === 'error') problems.push(message.text())
      })
      page.on('pageerror', (error) => problems.push(error.message))
      const scripts = new Set<string>()
      page.on('response', (response) => {
        const url = new URL(response.url())
        if (url.pathname.startsWith('/assets/') && url.pathname.endsWith('.js')) scripts.add(url.pathname)
      })
      await page.goto(`${stack.baseUrl}/catalogue`, { waitUntil: 'commit', timeout: 60_000 })
      try {
        await page.waitForSelector(FIRST_ROW, { timeout: 60_000 })
      } catch (error) {
        // Leave evidence of what the page showed instead of the row.
        const shot = path.join(clientDir, '..', 'client-failure.png')
        await page.screenshot({ path: shot, fullPage: true }).catch(() => undefined)
        const text = (await page.locator('body').innerText().catch(() => '')).slice(0, 300)
        throw new Error(`no catalogue row within 60 s (screenshot ${shot}; page text: ${text.replace(/\s+/g, ' ')}; console: ${problems.slice(0, 3).join(' | ')})`, { cause: error })
      }
      // performance.now() counts from the navigation's start in the page's own clock.
      samples.push(await page.evaluate(() => performance.now()))
      jsKb = [...scripts].reduce((sum, url) => sum + gzipKb(path.join(clientDir, url.replace(/^\//, ''))), 0)
      await context.close()
    }
    const ms = round(median(samples), 0)
    emit('client-first-row', { url: '/catalogue', loads, medianMs: ms, samplesMs: samples.map((s) => round(s, 0)), jsLoadedGzipKb: round(jsKb, 1), browser: browser.version() })
    check('client: catalogue first row (cold, median)', `${ms} ms`, 'informational', undefined)
  } finally {
    await browser.close()
  }
}

export async function benchClient(stack: BenchStack, quick: boolean): Promise<void> {
  const clientDir = stack.clientDir
  if (!clientDir || !existsSync(path.join(clientDir, 'index.html'))) {
    emit('client', { skipped: true, reason: 'no client build' })
    return
  }
  bundleSizes(clientDir)
  await firstRow(stack, clientDir, quick ? 3 : 5)
}
