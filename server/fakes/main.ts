// Runs both local fakes (mail and payments) until SIGTERM or SIGINT: `tsx server/fakes/main.ts`.
import { readFakesConfig } from './fakes-config'
import { startFakeMail, type FakeMailHandle } from './mail/fake-mail'
import { startFakePayments, type FakePaymentsHandle } from './payments/fake-payments'

async function main(): Promise<void> {
  const config = readFakesConfig(process.env)
  let mail: FakeMailHandle | null = null
  let payments: FakePaymentsHandle | null = null

  let stopping = false
  const stop = (signal: string): void => {
    if (stopping) {
      // A second signal while closing means "now".
      process.exit(1)
    }
    stopping = true
    console.log(`fakes stopping (${signal})`)
    Promise.all([mail?.close(), payments?.close()]).then(
      () => process.exit(0),
      (error: unknown) => {
        console.error('fakes did not stop cleanly', error)
        process.exit(1)
      },
    )
  }
  process.on('SIGTERM', () => stop('SIGTERM'))
  process.on('SIGINT', () => stop('SIGINT'))

  try {
    mail = await startFakeMail(config.mail)
    payments = await startFakePayments(config.payments)
  } catch (error) {
    await Promise.all([mail?.close(), payments?.close()])
    throw error
  }
  // One line, parsed by the scripts that wait for the fakes: keep its shape.
  console.log(
    `fakes ready mail-smtp=${mail.smtpPort} mail-http=${mail.httpPort} pay=${payments.port} ` +
      `mail-dir=${mail.dir} pay-url=${payments.url}`,
  )
}

main().catch((error: unknown) => {
  console.error(error instanceof Error ? error.message : error)
  process.exit(1)
})
