// Local stand-in for a mail server: captures every message sent to it and shows them over HTTP.
import { createServer, type Server } from 'node:http'
import { SMTPServer } from 'smtp-server'
import { createMailApi } from './mail-api'
import { MailStore } from './mail-store'

export interface FakeMailOptions {
  /** 0 picks a free port. */
  smtpPort: number
  /** 0 picks a free port. */
  httpPort: number
  /** Where messages are kept; created when missing, and read again on the next start. */
  dir: string
  /** Loopback by default; the fake has no authentication, so keep it there. */
  host?: string
  /** Largest message accepted, in bytes (default 25 MiB). */
  maxMessageBytes?: number
}

export interface FakeMailHandle {
  smtpPort: number
  httpPort: number
  host: string
  dir: string
  /** Stops both servers and frees both ports; a new start on the same ports and dir carries on. */
  close(): Promise<void>
}

const DEFAULT_MAX_BYTES = 25 * 1024 * 1024

export async function startFakeMail(options: FakeMailOptions): Promise<FakeMailHandle> {
  const host = options.host ?? '127.0.0.1'
  const maxBytes = options.maxMessageBytes ?? DEFAULT_MAX_BYTES
  const store = new MailStore(options.dir)
  await store.init()

  const smtp = new SMTPServer({
    // smtp-server's bundled certificate has expired, and a local fake needs no TLS.
    disabledCommands: ['STARTTLS'],
    authOptional: true,
    // A client set up with credentials for a real server may still log in: any name is accepted.
    allowInsecureAuth: true,
    onAuth(auth, _session, callback) {
      callback(null, { user: auth.username ?? 'anonymous' })
    },
    size: maxBytes,
    logger: false,
    banner: 'Spinwright fake mail server (messages are captured, never delivered)',
    // Pooled clients keep connections open; do not let them hold a close() up for long.
    closeTimeout: 300,
    onData(stream, session, callback) {
      const chunks: Buffer[] = []
      stream.on('data', (chunk: Buffer) => chunks.push(chunk))
      stream.on('error', (error: Error) => callback(error))
      stream.on('end', () => {
        if (stream.sizeExceeded) {
          callback(Object.assign(new Error('Message exceeds the size limit of the fake mail server'), { responseCode: 552 }))
          return
        }
        const envelope = {
          from: session.envelope.mailFrom ? session.envelope.mailFrom.address : null,
          to: session.envelope.rcptTo.map((rcpt) => rcpt.address),
        }
        store.save(Buffer.concat(chunks), envelope).then(
          (meta) => callback(null, `Message captured as ${meta.id}`),
          (error: unknown) => {
            console.error('[fake-mail] could not store a message', error)
            callback(Object.assign(new Error('The fake mail server could not store the message'), { responseCode: 451 }))
          },
        )
      })
    },
  })
  smtp.on('error', (error) => {
    console.error('[fake-mail] SMTP error', error)
  })

  const http = createServer(createMailApi(store))

  const smtpPort = await listen(smtp.server, options.smtpPort, host)
  let httpPort: number
  try {
    httpPort = await listen(http, options.httpPort, host)
  } catch (error) {
    await new Promise<void>((resolve) => smtp.close(resolve))
    throw error
  }

  let closing: Promise<void> | null = null
  return {
    smtpPort,
    httpPort,
    host,
    dir: store.dir,
    close() {
      closing ??= Promise.all([
        new Promise<void>((resolve) => smtp.close(resolve)),
        new Promise<void>((resolve) => {
          http.close(() => resolve())
          http.closeAllConnections()
        }),
      ]).then(() => undefined)
      return closing
    },
  }
}

function listen(server: Server | SMTPServer['server'], port: number, host: string): Promise<number> {
  return new Promise((resolve, reject) => {
    const onError = (error: Error): void => reject(error)
    server.once('error', onError)
    server.listen(port, host, () => {
      server.off('error', onError)
      const address = server.address()
      if (address === null || typeof address === 'string') reject(new Error('server has no TCP address'))
      else resolve(address.port)
    })
  })
}
