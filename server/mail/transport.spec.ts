import { describe, expect, it } from 'vitest'
import { isInsideDataDir } from './outbox'
import { smtpOptions } from './transport'

const fake = { SMTP_HOST: '127.0.0.1', SMTP_PORT: 2525, SMTP_SECURE: false, SMTP_USER: undefined, SMTP_PASSWORD: undefined }

describe('smtpOptions', () => {
  it('talks plain SMTP without credentials to the local fake', () => {
    expect(smtpOptions(fake)).toMatchObject({ host: '127.0.0.1', port: 2525, secure: false, requireTLS: false, auth: undefined })
  })

  it('uses TLS from the first byte when SMTP_SECURE is set', () => {
    expect(smtpOptions({ ...fake, SMTP_HOST: 'smtp.example.test', SMTP_PORT: 465, SMTP_SECURE: true, SMTP_USER: 'u', SMTP_PASSWORD: 'p' })).toMatchObject({
      secure: true,
      requireTLS: false,
      auth: { user: 'u', pass: 'p' },
    })
  })

  it('insists on STARTTLS before sending credentials to a remote server on a plain port', () => {
    expect(smtpOptions({ ...fake, SMTP_HOST: 'smtp.example.test', SMTP_PORT: 587, SMTP_USER: 'u', SMTP_PASSWORD: 'p' })).toMatchObject({ secure: false, requireTLS: true })
  })
})

describe('isInsideDataDir', () => {
  it('accepts relative paths below the data directory only', () => {
    expect(isInsideDataDir('quotes/SW-2031-00042B.pdf')).toBe(true)
    expect(isInsideDataDir('quotes/../quotes/a.pdf')).toBe(true)
    expect(isInsideDataDir('../secrets.txt')).toBe(false)
    expect(isInsideDataDir('quotes/../../x')).toBe(false)
    expect(isInsideDataDir('..\\x')).toBe(false)
    expect(isInsideDataDir('/etc/passwd')).toBe(false)
    expect(isInsideDataDir('.')).toBe(false)
  })
})
