import { randomUUID } from 'node:crypto'
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import path from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import request from 'supertest'
import { AuditEntry, Datasheet, MotorVariant } from '../../server/db/entities'
import { DATASHEET_MAX_BYTES } from '../../shared/contracts/import.contract'
import { insertVariants } from './catalogue-fixtures'
import { createUser, signInAs, startTestApp, type SignedInAgent, type TestContext } from './support'

let ctx: TestContext
let admin: SignedInAgent
let dataDir: string
const prefix = `DS${randomUUID().slice(0, 6).toUpperCase()}`
const part = `${prefix}-S120`
const other = `${prefix}-P230`
let familyCode: string

/** A small but well-formed PDF (header, one empty page, trailer). */
function pdf(marker = 'x'): Buffer {
  return Buffer.from(
    `%PDF-1.4\n1 0 obj << /Type /Catalog /Pages 2 0 R >> endobj\n2 0 obj << /Type /Pages /Kids [3 0 R] /Count 1 >> endobj\n3 0 obj << /Type /Page /Parent 2 0 R /MediaBox [0 0 612 792] >> endobj\n% ${marker}\ntrailer << /Root 1 0 R >>\n%%EOF\n`,
    'latin1',
  )
}

beforeAll(async () => {
  dataDir = mkdtempSync(path.join(tmpdir(), 'spinwright-datasheets-'))
  ctx = await startTestApp({ DATA_DIR: dataDir })
  admin = await signInAs(ctx, await createUser(ctx.dataSource, 'admin'))
  await insertVariants(ctx.dataSource, prefix, [
    { partNumber: 'S120', type: 'shaded-pole', volts: 120, hz: 60 },
    { partNumber: 'P230', type: 'psc', volts: 230, hz: 50 },
  ])
  const variant = await ctx.dataSource.getRepository(MotorVariant).findOneOrFail({ where: { partNumber: part }, relations: { family: true } })
  familyCode = variant.family.code
})
afterAll(async () => {
  await ctx.close()
  rmSync(dataDir, { recursive: true, force: true })
})

function upload(file: Buffer, name: string, fields: Record<string, string> = { partNumber: part }) {
  const call = admin.agent.post('/api/admin/catalogue/datasheets').set('X-CSRF-Token', admin.csrf)
  for (const [key, value] of Object.entries(fields)) call.field(key, value)
  return call.attach('file', file, name)
}

const storedFiles = () => (existsSync(path.join(dataDir, 'datasheets')) ? readdirSync(path.join(dataDir, 'datasheets')) : [])

describe('POST /api/admin/catalogue/datasheets', () => {
  it('stores a PDF under a generated name, lists it on the variant page and serves it to anyone with the original name', async () => {
    const body = pdf('first')
    const response = await upload(body, 'SP-84 datasheet rev B.pdf')
    expect(response.status).toBe(201)
    expect(response.body).toMatchObject({ originalName: 'SP-84 datasheet rev B.pdf', sizeBytes: body.length, partNumber: part, familyCode: null })
    const row = await ctx.dataSource.getRepository(Datasheet).findOneByOrFail({ id: response.body.id })
    expect(row.storedName).toMatch(/^[0-9a-f-]{36}\.pdf$/)
    expect(readFileSync(path.join(dataDir, 'datasheets', row.storedName)).equals(body)).toBe(true)
    expect(await ctx.dataSource.getRepository(AuditEntry).countBy({ entity: 'datasheet', entityId: row.id, action: 'upload' })).toBe(1)

    const detail = await request(ctx.handle.app).get(`/api/v1/catalogue/variants/${part}`)
    expect(detail.body.datasheets.map((d: { id: string }) => d.id)).toContain(row.id)

    const download = await request(ctx.handle.app).get(`/api/v1/catalogue/variants/${part}/datasheets/${row.id}`).buffer(true)
    expect(download.status).toBe(200)
    expect(download.headers['content-type']).toBe('application/pdf')
    expect(download.headers['content-disposition']).toBe(`attachment; filename="SP-84 datasheet rev B.pdf"; filename*=UTF-8''SP-84%20datasheet%20rev%20B.pdf`)
    expect(Buffer.from(download.body).equals(body)).toBe(true)
  })

  it('refuses a file that is not a PDF even when it is named .pdf (400 naming the field), storing nothing', async () => {
    const before = storedFiles().length
    const response = await upload(Buffer.from('MZ\x90\x00 this is an executable pretending', 'latin1'), 'datasheet.pdf')
    expect(response.status).toBe(400)
    expect(response.body.error.fields.file).toContain('not a PDF')
    const text = await upload(Buffer.from('name,value\nr1,12\n'), 'curve.pdf')
    expect(text.status).toBe(400)
    expect(storedFiles().length).toBe(before)
  })

  it('refuses a file over the limit with 413 and a message that names the limit', async () => {
    const big = Buffer.concat([pdf(), Buffer.alloc(DATASHEET_MAX_BYTES, 0x20)])
    const response = await upload(big, 'huge.pdf')
    expect(response.status).toBe(413)
    expect(response.body.error.code).toBe('file_too_large')
    expect(response.body.error.message).toBe('Datasheets may be at most 10 MB; this file is larger')
  })

  it('stores a path-traversal file name safely: generated file name, cleaned original name', async () => {
    const before = new Set(storedFiles())
    const response = await upload(pdf('traversal'), '../../etc/passwd.pdf')
    expect(response.status).toBe(201)
    expect(response.body.originalName).toBe('passwd.pdf')
    const added = storedFiles().filter((name) => !before.has(name))
    expect(added).toHaveLength(1)
    expect(added[0]).toMatch(/^[0-9a-f-]{36}\.pdf$/)
    expect(existsSync(path.join(dataDir, 'etc'))).toBe(false)
    expect(existsSync(path.join(dataDir, '..', 'etc', 'passwd.pdf'))).toBe(false)
    const windows = await upload(pdf('windows'), '..\\..\\Windows\\"evil"\r\n.pdf')
    expect(windows.body.originalName).toBe('evil.pdf')
  })

  it('keeps a non-ASCII name for the download with an ASCII fallback', async () => {
    const response = await upload(pdf('umlaut'), 'Lüfter-Motor Datenblatt.pdf')
    expect(response.body.originalName).toBe('Lüfter-Motor Datenblatt.pdf')
    const download = await request(ctx.handle.app).get(`/api/v1/catalogue/variants/${part}/datasheets/${response.body.id}`)
    expect(download.headers['content-disposition']).toBe(`attachment; filename="L_fter-Motor Datenblatt.pdf"; filename*=UTF-8''L%C3%BCfter-Motor%20Datenblatt.pdf`)
  })

  it("attaches a family's datasheet to every variant of the family, and to no other", async () => {
    const response = await upload(pdf('family'), 'family.pdf', { familyCode })
    expect(response.status).toBe(201)
    expect(response.body.familyCode).toBe(familyCode)
    const detail = await request(ctx.handle.app).get(`/api/v1/catalogue/variants/${part}`)
    expect(detail.body.datasheets.map((d: { id: string }) => d.id)).toContain(response.body.id)
    const elsewhere = await request(ctx.handle.app).get(`/api/v1/catalogue/variants/${other}/datasheets/${response.body.id}`)
    expect(elsewhere.status).toBe(404)
  })

  it('needs exactly one target and a file', async () => {
    expect((await upload(pdf(), 'a.pdf', {})).status).toBe(400)
    expect((await upload(pdf(), 'a.pdf', { partNumber: part, familyCode })).status).toBe(400)
    const unknown = await upload(pdf(), 'a.pdf', { partNumber: 'NO-SUCH-PART' })
    expect(unknown.status).toBe(400)
    expect(unknown.body.error.fields.partNumber).toContain('no variant')
    const none = await admin.agent.post('/api/admin/catalogue/datasheets').set('X-CSRF-Token', admin.csrf).field('partNumber', part)
    expect(none.status).toBe(400)
    expect(none.body.error.fields.file).toBeDefined()
  })
})

describe('GET and DELETE /api/admin/catalogue/datasheets', () => {
  it('lists datasheets by variant and deletes one with its file', async () => {
    const created = await upload(pdf('to delete'), 'old.pdf')
    const list = await admin.agent.get('/api/admin/catalogue/datasheets').query({ partNumber: part })
    expect(list.status).toBe(200)
    expect(list.body.items.map((d: { id: string }) => d.id)).toContain(created.body.id)
    const row = await ctx.dataSource.getRepository(Datasheet).findOneByOrFail({ id: created.body.id })
    const removed = await admin.agent.delete(`/api/admin/catalogue/datasheets/${created.body.id}`).set('X-CSRF-Token', admin.csrf)
    expect(removed.status).toBe(204)
    expect(existsSync(path.join(dataDir, 'datasheets', row.storedName))).toBe(false)
    expect(await ctx.dataSource.getRepository(Datasheet).countBy({ id: created.body.id })).toBe(0)
    const download = await request(ctx.handle.app).get(`/api/v1/catalogue/variants/${part}/datasheets/${created.body.id}`)
    expect(download.status).toBe(404)
    const again = await admin.agent.delete(`/api/admin/catalogue/datasheets/${created.body.id}`).set('X-CSRF-Token', admin.csrf)
    expect(again.status).toBe(404)
  })
})
