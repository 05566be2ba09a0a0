import { spawn } from 'node:child_process'
import { mkdtemp, rm } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import path from 'node:path'
import { describe, expect, it } from 'vitest'
import { readFakesConfig } from './fakes-config'

const root = path.resolve(import.meta.dirname, '../..')
const webhook = { PAY_WEBHOOK_URL: 'http://127.0.0.1:3000/api/payments/webhook', STRIPE_WEBHOOK_SECRET: 'whsec_x' }

describe('readFakesConfig', () => {
  it('fills in the default ports and directory', () => {
    expect(readFakesConfig(webhook)).toEqual({
      mail: { smtpPort: 2525, httpPort: 2580, dir: 'data/mail' },
      payments: { port: 4242, webhookUrl: webhook.PAY_WEBHOOK_URL, webhookSecret: 'whsec_x' },
    })
  })

  it('names every variable that is missing or wrong', () => {
    expect(() => readFakesConfig({ MAIL_SMTP_PORT: 'twenty-five' })).toThrow(
      /MAIL_SMTP_PORT[\s\S]*PAY_WEBHOOK_URL[\s\S]*STRIPE_WEBHOOK_SECRET/,
    )
  })
})

describe('tsx server/fakes/main.ts', () => {
  it('prints one ready line with the real ports, serves both fakes and stops on SIGTERM', async () => {
    const dir = await mkdtemp(path.join(tmpdir(), 'fakes-main-'))
    const child = spawn(path.join(root, 'node_modules/.bin/tsx'), ['server/fakes/main.ts'], {
      cwd: root,
      env: { ...process.env, ...webhook, MAIL_SMTP_PORT: '0', MAIL_HTTP_PORT: '0', PAY_PORT: '0', MAIL_DIR: dir },
      stdio: ['ignore', 'pipe', 'pipe'],
    })
    try {
      const line = await new Promise<string>((resolve, reject) => {
        let out = ''
        child.stdout.on('data', (chunk: Buffer) => {
          out += chunk.toString()
          const ready = out.split('\n').find((entry) => entry.startsWith('fakes ready'))
          if (ready) resolve(ready)
        })
        child.once('exit', (code) => reject(new Error(`exited early with ${code}`)))
        setTimeout(() => reject(new Error('no ready line within 15 s')), 15_000)
      })
      const ports = /mail-smtp=(\d+) mail-http=(\d+) pay=(\d+)/.exec(line)
      expect(ports).not.toBeNull()
      const [, , mailHttp, pay] = ports ?? []
      expect(await (await fetch(`http://127.0.0.1:${mailHttp}/messages`)).json()).toEqual({ messages: [] })
      expect(await (await fetch(`http://127.0.0.1:${pay}/_fake/health`)).json()).toMatchObject({ ok: true })

      const exit = new Promise<number | null>((resolve) => child.once('exit', resolve))
      child.kill('SIGTERM')
      expect(await exit).toBe(0)
    } finally {
      if (child.exitCode === null) child.kill('SIGKILL')
      await rm(dir, { recursive: true, force: true })
    }
  }, 30_000)
})
