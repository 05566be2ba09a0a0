// The audit log: written by the admin services inside their own transactions, read (filtered and
// paged) by the admin's audit screen.
import type { DataSource, EntityManager } from 'typeorm'
import type { AuditFacets, AuditQuery, AuditRow, Page } from '../../shared/contracts/admin.contract'
import { addDays } from '../../shared/pricing'
import { AuditEntry } from '../db/entities'

/** Who did it: a signed-in person, or null for the system. */
export interface AuditActor {
  id: string
  email: string
}

/** Writes one audit entry with `manager`, so it commits or rolls back with the change it records. */
export async function recordAudit(
  manager: EntityManager,
  actor: AuditActor | null,
  entity: string,
  entityId: string,
  action: string,
  detail: Record<string, unknown> | null = null,
): Promise<void> {
  await manager.save(manager.create(AuditEntry, { actorId: actor?.id ?? null, actorEmail: actor?.email ?? null, entity, entityId, action, detail }))
}

/** { field: { before, after } } for the fields that changed; empty when nothing did. */
export function changesBetween<T extends object>(before: T, after: Partial<T>): Record<string, { before: unknown; after: unknown }> {
  const changes: Record<string, { before: unknown; after: unknown }> = {}
  for (const key in after) {
    if (!Object.hasOwn(after, key)) continue
    const was = before[key]
    const now = after[key]
    if (JSON.stringify(was) !== JSON.stringify(now)) changes[key] = { before: was, after: now }
  }
  return changes
}

function likeTerm(value: string): string {
  return `%${value.replace(/[\\%_]/g, '\\$&')}%`
}

export class AdminAuditService {
  constructor(private readonly dataSource: DataSource) {}

  async list(query: AuditQuery): Promise<Page<AuditRow>> {
    const builder = this.dataSource
      .getRepository(AuditEntry)
      .createQueryBuilder('entry')
      .orderBy('entry.at', 'DESC')
      .addOrderBy('entry.id', 'DESC')
      .skip((query.page - 1) * query.pageSize)
      .take(query.pageSize)
    if (query.entity) builder.andWhere('entry.entity = :entity', { entity: query.entity })
    if (query.entityId) builder.andWhere('entry.entityId = :entityId', { entityId: query.entityId })
    if (query.action) builder.andWhere('entry.action = :action', { action: query.action })
    if (query.actor) builder.andWhere('entry.actorEmail LIKE :actor', { actor: likeTerm(query.actor.toLowerCase()) })
    // Calendar days in UTC, both ends included: [from 00:00, to + 1 day 00:00).
    if (query.from) builder.andWhere('entry.at >= :from', { from: new Date(`${query.from}T00:00:00.000Z`) })
    if (query.to) builder.andWhere('entry.at < :to', { to: new Date(`${addDays(query.to, 1)}T00:00:00.000Z`) })
    const [rows, total] = await builder.getManyAndCount()
    return {
      items: rows.map((row) => ({
        id: String(row.id),
        at: row.at.toISOString(),
        actorId: row.actorId,
        actorEmail: row.actorEmail,
        entity: row.entity,
        entityId: row.entityId,
        action: row.action,
        detail: row.detail,
      })),
      total,
      page: query.page,
      pageSize: query.pageSize,
    }
  }

  async facets(): Promise<AuditFacets> {
    const repository = this.dataSource.getRepository(AuditEntry)
    const entities = await repository.createQueryBuilder('entry').select('DISTINCT entry.entity', 'value').orderBy('value', 'ASC').getRawMany<{ value: string }>()
    const actions = await repository.createQueryBuilder('entry').select('DISTINCT entry.action', 'value').orderBy('value', 'ASC').getRawMany<{ value: string }>()
    return { entities: entities.map((row) => row.value), actions: actions.map((row) => row.value) }
  }
}
