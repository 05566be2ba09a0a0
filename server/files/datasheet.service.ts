// Datasheet files: PDFs attached to a family or a variant. The type is decided by the content (the
// "%PDF-" signature), never by the name; files are stored under DATA_DIR/datasheets with generated
// names; the uploader's file name is kept, cleaned, only to name the download.
import { createHash, randomUUID } from 'node:crypto'
import { mkdir, open, rm, writeFile } from 'node:fs/promises'
import path from 'node:path'
import type { Readable } from 'node:stream'
import { createReadStream } from 'node:fs'
import type { DataSource } from 'typeorm'
import { IsNull } from 'typeorm'
import type { SessionUser } from '../../shared/contracts/auth.contract'
import type { DatasheetRecord } from '../../shared/contracts/catalogue.contract'
import { DATASHEET_MAX_BYTES, type AdminDatasheetRow } from '../../shared/contracts/import.contract'
import { AuditEntry, Datasheet, MotorFamily, MotorVariant } from '../db/entities'
import { AppError, NotFoundError, ValidationError } from '../http/errors'
import { bumpCatalogueRevision } from '../services/catalogue.service'

export const PDF_SIGNATURE = Buffer.from('%PDF-', 'latin1')

/** True when the bytes start like a PDF file (ISO 32000-1, 7.5.2: the header line "%PDF-1.n"). */
export function looksLikePdf(bytes: Buffer): boolean {
  return bytes.length > PDF_SIGNATURE.length && bytes.subarray(0, PDF_SIGNATURE.length).equals(PDF_SIGNATURE)
}

/**
 * The uploader's file name reduced to a plain last segment: no folders (either slash), no control
 * characters, no leading dots, at most 200 characters; "datasheet.pdf" when nothing is left.
 */
export function cleanFileName(name: string): string {
  const last = name.split(/[\\/]/).pop() ?? ''
  const cleaned = last
    .replace(/[\u0000-\u001f\u007f"<>|:*?]/g, '')
    .replace(/^[.\s]+/, '')
    .trim()
    .slice(0, 200)
  return cleaned === '' ? 'datasheet.pdf' : cleaned
}

/** RFC 6266 / RFC 5987: an ASCII fallback and the UTF-8 name, both safe inside the header. */
export function contentDisposition(name: string, kind: 'attachment' | 'inline' = 'attachment'): string {
  const fallback = name.replace(/[^\x20-\x7e]/g, '_').replace(/["\\]/g, '_')
  const encoded = encodeURIComponent(name).replace(/['()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`)
  return `${kind}; filename="${fallback}"; filename*=UTF-8''${encoded}`
}

export type DatasheetTarget = { kind: 'family'; code: string } | { kind: 'variant'; partNumber: string }

export class DatasheetService {
  private readonly folder: string

  constructor(
    private readonly dataSource: DataSource,
    dataDir: string,
    private readonly log: (error: unknown) => void = console.error,
  ) {
    this.folder = path.join(path.resolve(dataDir), 'datasheets')
  }

  private fileOf(storedName: string): string {
    // Stored names are generated (<uuid>.pdf); the check keeps a corrupted row from reaching outside.
    if (!/^[0-9a-f-]{36}\.pdf$/.test(storedName)) throw new Error(`datasheet stored name ${storedName} is not a generated one`)
    return path.join(this.folder, storedName)
  }

  async upload(file: { buffer: Buffer; originalname: string; size: number } | undefined, target: DatasheetTarget, user: SessionUser): Promise<AdminDatasheetRow> {
    if (!file) throw new ValidationError({ file: 'choose a PDF file to upload' })
    if (file.size > DATASHEET_MAX_BYTES || file.buffer.length > DATASHEET_MAX_BYTES) throw datasheetTooLarge()
    if (file.buffer.length === 0) throw new ValidationError({ file: 'the file is empty' })
    if (!looksLikePdf(file.buffer)) throw new ValidationError({ file: 'this is not a PDF file (its content does not start with %PDF-), whatever its name says' }, 'Only PDF datasheets can be uploaded')
    const owner = await this.resolve(target)
    const originalName = cleanFileName(file.originalname)
    const storedName = `${randomUUID()}.pdf`
    await mkdir(this.folder, { recursive: true })
    const filePath = this.fileOf(storedName)
    // 'wx': never overwrite; the file is complete on disk before the row that points at it exists.
    await writeFile(filePath, file.buffer, { flag: 'wx' })
    const handle = await open(filePath, 'r')
    try {
      await handle.sync()
    } finally {
      await handle.close()
    }
    try {
      return await this.dataSource.transaction(async (manager) => {
        const row = manager.create(Datasheet, {
          id: randomUUID(),
          familyId: owner.familyId,
          variantId: owner.variantId,
          storedName,
          originalName,
          sizeBytes: file.buffer.length,
          sha256: createHash('sha256').update(file.buffer).digest('hex'),
          uploadedById: user.id,
          uploadedByEmail: user.email,
        })
        await manager.insert(Datasheet, row)
        await bumpCatalogueRevision(manager)
        await manager.save(AuditEntry, {
          actorId: user.id,
          actorEmail: user.email,
          entity: 'datasheet',
          entityId: row.id,
          action: 'upload',
          detail: { originalName, sizeBytes: row.sizeBytes, familyCode: owner.familyCode, partNumber: owner.partNumber, storedName },
        })
        const saved = await manager.findOneByOrFail(Datasheet, { id: row.id })
        return { id: saved.id, originalName, sizeBytes: saved.sizeBytes, uploadedAt: saved.createdAt.toISOString(), uploadedBy: user.email, familyCode: owner.familyCode, partNumber: owner.partNumber }
      })
    } catch (error) {
      await rm(filePath, { force: true }).catch(this.log)
      throw error
    }
  }

  private async resolve(target: DatasheetTarget): Promise<{ familyId: string | null; variantId: string | null; familyCode: string | null; partNumber: string | null }> {
    if (target.kind === 'family') {
      const family = await this.dataSource.getRepository(MotorFamily).findOneBy({ code: target.code })
      if (!family) throw new ValidationError({ familyCode: `no family ${target.code} in the catalogue` })
      return { familyId: family.id, variantId: null, familyCode: family.code, partNumber: null }
    }
    const variant = await this.dataSource.getRepository(MotorVariant).findOneBy({ partNumber: target.partNumber })
    if (!variant) throw new ValidationError({ partNumber: `no variant ${target.partNumber} in the catalogue` })
    return { familyId: null, variantId: variant.id, familyCode: null, partNumber: variant.partNumber }
  }

  async list(filter: { familyCode?: string; partNumber?: string }): Promise<AdminDatasheetRow[]> {
    const builder = this.dataSource
      .getRepository(Datasheet)
      .createQueryBuilder('sheet')
      .leftJoinAndSelect('sheet.family', 'family')
      .leftJoinAndSelect('sheet.variant', 'variant')
      .orderBy('sheet.createdAt', 'DESC')
      .take(500)
    if (filter.familyCode) builder.andWhere('family.code = :code', { code: filter.familyCode })
    if (filter.partNumber) builder.andWhere('variant.partNumber = :part', { part: filter.partNumber })
    const rows = await builder.getMany()
    return rows.map((row) => ({
      id: row.id,
      originalName: row.originalName,
      sizeBytes: row.sizeBytes,
      uploadedAt: row.createdAt.toISOString(),
      uploadedBy: row.uploadedByEmail,
      familyCode: row.family?.code ?? null,
      partNumber: row.variant?.partNumber ?? null,
    }))
  }

  async remove(id: string, user: SessionUser): Promise<void> {
    const storedName = await this.dataSource.transaction(async (manager) => {
      const row = await manager.findOne(Datasheet, { where: { id }, lock: { mode: 'pessimistic_write' } })
      if (!row) throw new NotFoundError('Datasheet')
      await manager.delete(Datasheet, { id })
      await bumpCatalogueRevision(manager)
      await manager.save(AuditEntry, { actorId: user.id, actorEmail: user.email, entity: 'datasheet', entityId: id, action: 'delete', detail: { originalName: row.originalName, storedName: row.storedName } })
      return row.storedName
    })
    // The row is gone first: a file left behind by a failed unlink is harmless, a row without a file is not.
    await rm(this.fileOf(storedName), { force: true }).catch(this.log)
  }

  /** Datasheets shown on a variant page: the variant's own and its family's, newest first. */
  async forVariant(variantId: string, familyId: string): Promise<DatasheetRecord[]> {
    const rows = await this.dataSource.getRepository(Datasheet).find({ where: [{ variantId }, { familyId, variantId: IsNull() }], order: { createdAt: 'DESC' } })
    return rows.map((row) => ({ id: row.id, originalName: row.originalName, sizeBytes: row.sizeBytes, uploadedAt: row.createdAt.toISOString() }))
  }

  /** Opens a datasheet of this variant (or its family) for download. */
  async open(partNumber: string, id: string): Promise<{ name: string; size: number; stream: Readable }> {
    const variant = await this.dataSource.getRepository(MotorVariant).findOneBy({ partNumber })
    if (!variant) throw new NotFoundError('Motor')
    const row = await this.dataSource.getRepository(Datasheet).findOneBy({ id })
    if (!row || (row.variantId !== variant.id && row.familyId !== variant.familyId)) throw new NotFoundError('Datasheet')
    const filePath = this.fileOf(row.storedName)
    const stream = createReadStream(filePath)
    await new Promise<void>((resolve, reject) => {
      stream.once('open', () => resolve())
      stream.once('error', (error) => reject(error))
    }).catch((error: unknown) => {
      this.log(error)
      throw new AppError(410, 'file_missing', 'The file of this datasheet is missing on the server; the fault has been logged')
    })
    return { name: row.originalName, size: row.sizeBytes, stream }
  }
}

export function datasheetTooLarge(): AppError {
  return new AppError(413, 'file_too_large', `Datasheets may be at most ${DATASHEET_MAX_BYTES / (1024 * 1024)} MB; this file is larger. Compress the PDF or split it`, {
    file: `larger than ${DATASHEET_MAX_BYTES / (1024 * 1024)} MB`,
  })
}
