// Disk store of the fake SMTP server: one raw .eml file plus one small JSON record per message.
import { randomBytes } from 'node:crypto'
import { mkdir, readFile, readdir, rename, rm, writeFile } from 'node:fs/promises'
import path from 'node:path'
import { z } from 'zod'

/** What the store keeps beside each raw message. */
export interface StoredMessageMeta {
  id: string
  envelope: { from: string | null; to: string[] }
  /** ISO 8601 time the fake accepted the message. */
  receivedAt: string
  /** Size of the raw message in bytes. */
  size: number
}

const metaSchema = z.object({
  id: z.string(),
  envelope: z.object({ from: z.string().nullable(), to: z.array(z.string()) }),
  receivedAt: z.string(),
  size: z.number().int().nonnegative(),
})

// Ids are made here, never taken from a request, and they double as file names: the millisecond
// stamp keeps them sortable, the random tail keeps two messages in one millisecond apart.
const ID_PATTERN = /^[0-9]{13}-[0-9a-f]{12}$/

export function isMessageId(value: string): boolean {
  return ID_PATTERN.test(value)
}

function newMessageId(now: Date): string {
  return `${String(now.getTime()).padStart(13, '0')}-${randomBytes(6).toString('hex')}`
}

export class MailStore {
  readonly dir: string

  constructor(dir: string) {
    this.dir = path.resolve(dir)
  }

  async init(): Promise<void> {
    await mkdir(this.dir, { recursive: true })
  }

  private file(id: string, ext: 'eml' | 'json'): string {
    if (!isMessageId(id)) throw new Error(`not a message id: ${id}`)
    return path.join(this.dir, `${id}.${ext}`)
  }

  /** Writes the raw message first and the record last, so a listed record always has its .eml. */
  async save(raw: Buffer, envelope: StoredMessageMeta['envelope'], now = new Date()): Promise<StoredMessageMeta> {
    const id = newMessageId(now)
    const meta: StoredMessageMeta = { id, envelope, receivedAt: now.toISOString(), size: raw.length }
    await writeAtomically(this.file(id, 'eml'), raw)
    await writeAtomically(this.file(id, 'json'), JSON.stringify(meta, null, 2))
    return meta
  }

  /** All records, newest first. Records that cannot be read are skipped rather than failing the list. */
  async list(): Promise<StoredMessageMeta[]> {
    const names = await readdir(this.dir)
    const ids = names
      .filter((name) => name.endsWith('.json'))
      .map((name) => name.slice(0, -'.json'.length))
      .filter(isMessageId)
    const metas = await Promise.all(ids.map((id) => this.meta(id)))
    return metas
      .filter((meta): meta is StoredMessageMeta => meta !== null)
      .sort((a, b) => (a.receivedAt === b.receivedAt ? b.id.localeCompare(a.id) : b.receivedAt.localeCompare(a.receivedAt)))
  }

  async meta(id: string): Promise<StoredMessageMeta | null> {
    if (!isMessageId(id)) return null
    try {
      const parsed = metaSchema.safeParse(JSON.parse(await readFile(this.file(id, 'json'), 'utf8')))
      return parsed.success && parsed.data.id === id ? parsed.data : null
    } catch (error) {
      if (isNotFound(error) || error instanceof SyntaxError) return null
      throw error
    }
  }

  async raw(id: string): Promise<Buffer | null> {
    if (!isMessageId(id)) return null
    try {
      return await readFile(this.file(id, 'eml'))
    } catch (error) {
      if (isNotFound(error)) return null
      throw error
    }
  }

  /** Removes one message; answers whether it existed. */
  async remove(id: string): Promise<boolean> {
    if (!isMessageId(id)) return false
    const existed = (await this.meta(id)) !== null
    // The record goes first so that the message disappears from lists before its body does.
    await rm(this.file(id, 'json'), { force: true })
    await rm(this.file(id, 'eml'), { force: true })
    return existed
  }

  /** Removes every message (only files this store could have written). */
  async clear(): Promise<number> {
    const names = await readdir(this.dir)
    let removed = 0
    for (const name of names) {
      const match = /^([0-9]{13}-[0-9a-f]{12})\.(json|eml)(\.tmp-[0-9a-f]+)?$/.exec(name)
      if (!match) continue
      await rm(path.join(this.dir, name), { force: true })
      if (match[2] === 'json' && match[3] === undefined) removed += 1
    }
    return removed
  }
}

async function writeAtomically(target: string, data: Buffer | string): Promise<void> {
  const temporary = `${target}.tmp-${randomBytes(4).toString('hex')}`
  await writeFile(temporary, data)
  await rename(temporary, target)
}

function isNotFound(error: unknown): boolean {
  return error instanceof Error && 'code' in error && error.code === 'ENOENT'
}
