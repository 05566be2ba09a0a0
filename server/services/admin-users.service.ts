// People: the admin's user list, invitations, role changes, disabling and sales discount limits.
// Each change writes its audit entry in the same transaction; changes that alter what someone may
// do end that person's sessions, so the next request is answered from the new state.
import { In, IsNull, type DataSource, type EntityManager } from 'typeorm'
import {
  MAKER_ROLES,
  type AdminUserRow,
  type InviteUserBody,
  type Page,
  type UserListQuery,
} from '../../shared/contracts/admin.contract'
import type { Role, SessionUser } from '../../shared/contracts/auth.contract'
import { Invitation, Organisation, SessionRecord, User } from '../db/entities'
import { ConflictError, NotFoundError, ValidationError } from '../http/errors'
import { recordAudit } from './admin-audit.service'
import { issueInvitation } from './invitation.service'

function likeTerm(value: string): string {
  return `%${value.replace(/[\\%_]/g, '\\$&')}%`
}

function statusOf(user: User): AdminUserRow['status'] {
  if (user.disabledAt) return 'disabled'
  return user.passwordHash ? 'active' : 'invited'
}

/** Staff roles live in the maker's organisation, buyers in customer organisations. */
export function roleFitsOrganisation(role: Role, organisation: Pick<Organisation, 'kind'>): boolean {
  return organisation.kind === 'maker' ? MAKER_ROLES.includes(role) : role === 'buyer'
}

function roleMismatch(organisation: Organisation): ValidationError {
  return new ValidationError({
    role:
      organisation.kind === 'maker'
        ? `${organisation.name} is the maker: its people are admins or sales engineers`
        : `${organisation.name} is a customer: its people are buyers`,
  })
}

export class AdminUserService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly portalUrl: string,
    private readonly now: () => Date = () => new Date(),
  ) {}

  async list(query: UserListQuery): Promise<Page<AdminUserRow>> {
    const builder = this.dataSource
      .getRepository(User)
      .createQueryBuilder('user')
      .innerJoinAndSelect('user.organisation', 'organisation')
      .orderBy('user.email', 'ASC')
      .skip((query.page - 1) * query.pageSize)
      .take(query.pageSize)
    if (query.role) builder.andWhere('user.role = :role', { role: query.role })
    if (query.organisationId) builder.andWhere('user.organisationId = :organisationId', { organisationId: query.organisationId })
    if (query.status === 'disabled') builder.andWhere('user.disabledAt IS NOT NULL')
    if (query.status === 'invited') builder.andWhere('user.disabledAt IS NULL AND user.passwordHash IS NULL')
    if (query.status === 'active') builder.andWhere('user.disabledAt IS NULL AND user.passwordHash IS NOT NULL')
    if (query.search) builder.andWhere('(user.email LIKE :term OR user.name LIKE :term OR organisation.name LIKE :term)', { term: likeTerm(query.search) })
    const [rows, total] = await builder.getManyAndCount()
    const invited = rows.filter((user) => !user.passwordHash).map((user) => user.id)
    const open = invited.length
      ? await this.dataSource.getRepository(Invitation).find({ where: { userId: In(invited), usedAt: IsNull(), revokedAt: IsNull() }, order: { expiresAt: 'DESC' } })
      : []
    const expiry = new Map<string, string>()
    for (const invitation of open) if (!expiry.has(invitation.userId)) expiry.set(invitation.userId, invitation.expiresAt.toISOString())
    return { items: rows.map((user) => this.row(user, expiry.get(user.id) ?? null)), total, page: query.page, pageSize: query.pageSize }
  }

  async get(id: string): Promise<AdminUserRow> {
    const user = await this.dataSource.getRepository(User).findOne({ where: { id }, relations: { organisation: true } })
    if (!user) throw new NotFoundError('User')
    const invitation = await this.dataSource.getRepository(Invitation).findOne({ where: { userId: id, usedAt: IsNull(), revokedAt: IsNull() }, order: { expiresAt: 'DESC' } })
    return this.row(user, user.passwordHash ? null : (invitation?.expiresAt.toISOString() ?? null))
  }

  /** Creates the account without a password and mails a set-password link. */
  async invite(actor: SessionUser, body: InviteUserBody): Promise<AdminUserRow> {
    const id = await this.dataSource.transaction(async (manager) => {
      const organisation = await manager.findOneBy(Organisation, { id: body.organisationId })
      if (!organisation) throw new ValidationError({ organisationId: 'no such organisation' })
      if (!roleFitsOrganisation(body.role, organisation)) throw roleMismatch(organisation)
      if (body.discountLimitBp !== undefined && body.discountLimitBp > 0 && body.role !== 'sales') {
        throw new ValidationError({ discountLimitBp: 'only sales engineers have a discount limit' })
      }
      if (await manager.existsBy(User, { email: body.email })) throw new ConflictError(`${body.email} already has an account`, 'email_taken')
      const user = await manager.save(
        manager.create(User, {
          email: body.email,
          name: body.name,
          role: body.role,
          organisationId: organisation.id,
          passwordHash: null,
          discountLimitBp: body.role === 'sales' ? (body.discountLimitBp ?? 0) : 0,
        }),
      )
      const invitation = await issueInvitation(manager, { user, organisationName: organisation.name, invitedBy: actor, portalUrl: this.portalUrl, now: this.now() })
      await recordAudit(manager, actor, 'user', user.id, 'invited', {
        email: user.email,
        name: user.name,
        role: user.role,
        organisation: organisation.name,
        discountLimitBp: user.discountLimitBp,
        invitationExpiresAt: invitation.expiresAt.toISOString(),
      })
      return user.id
    })
    return this.get(id)
  }

  /** A fresh link for someone who has not set a password yet; the old link stops working. */
  async resendInvitation(actor: SessionUser, id: string): Promise<AdminUserRow> {
    await this.dataSource.transaction(async (manager) => {
      const user = await this.lockUser(manager, id)
      if (user.passwordHash) throw new ConflictError(`${user.email} has already set a password`, 'already_active')
      if (user.disabledAt) throw new ConflictError(`${user.email} is disabled; enable the account first`, 'disabled')
      const organisation = await manager.findOneByOrFail(Organisation, { id: user.organisationId })
      const invitation = await issueInvitation(manager, { user, organisationName: organisation.name, invitedBy: actor, portalUrl: this.portalUrl, now: this.now() })
      await recordAudit(manager, actor, 'user', user.id, 'invitation-resent', { email: user.email, invitationExpiresAt: invitation.expiresAt.toISOString() })
    })
    return this.get(id)
  }

  async changeRole(actor: SessionUser, id: string, role: Role): Promise<AdminUserRow> {
    if (id === actor.id) throw new ConflictError('You cannot change your own role; ask another administrator', 'own_account')
    await this.dataSource.transaction(async (manager) => {
      const user = await this.lockUserGuardingAdmins(manager, id)
      if (user.role === role) return
      const organisation = await manager.findOneByOrFail(Organisation, { id: user.organisationId })
      if (!roleFitsOrganisation(role, organisation)) throw roleMismatch(organisation)
      if (user.role === 'admin') await this.ensureAnotherAdmin(manager, user.id)
      const discountLimitBp = role === 'sales' ? user.discountLimitBp : 0
      await manager.update(User, { id: user.id }, { role, discountLimitBp })
      // The new role must govern the very next request: end every session of the account.
      const ended = await manager.delete(SessionRecord, { userId: user.id })
      await recordAudit(manager, actor, 'user', user.id, 'role-changed', {
        email: user.email,
        role: { before: user.role, after: role },
        ...(discountLimitBp !== user.discountLimitBp ? { discountLimitBp: { before: user.discountLimitBp, after: discountLimitBp } } : {}),
        sessionsEnded: ended.affected ?? 0,
      })
    })
    return this.get(id)
  }

  async setDisabled(actor: SessionUser, id: string, disabled: boolean): Promise<AdminUserRow> {
    if (disabled && id === actor.id) throw new ConflictError('You cannot disable your own account', 'own_account')
    await this.dataSource.transaction(async (manager) => {
      const user = await this.lockUserGuardingAdmins(manager, id)
      if ((user.disabledAt !== null) === disabled) return
      if (disabled && user.role === 'admin') await this.ensureAnotherAdmin(manager, user.id)
      const disabledAt = disabled ? this.now() : null
      await manager.update(User, { id: user.id }, { disabledAt })
      let sessionsEnded = 0
      if (disabled) {
        sessionsEnded = (await manager.delete(SessionRecord, { userId: user.id })).affected ?? 0
        // An open invitation must not let a disabled person in either.
        await manager.update(Invitation, { userId: user.id, usedAt: IsNull(), revokedAt: IsNull() }, { revokedAt: disabledAt ?? this.now() })
      }
      await recordAudit(manager, actor, 'user', user.id, disabled ? 'disabled' : 'enabled', {
        email: user.email,
        disabledAt: { before: user.disabledAt?.toISOString() ?? null, after: disabledAt?.toISOString() ?? null },
        ...(disabled ? { sessionsEnded } : {}),
      })
    })
    return this.get(id)
  }

  async setDiscountLimit(actor: SessionUser, id: string, discountLimitBp: number): Promise<AdminUserRow> {
    await this.dataSource.transaction(async (manager) => {
      const user = await this.lockUser(manager, id)
      if (user.role !== 'sales') throw new ValidationError({ discountLimitBp: 'only sales engineers have a discount limit' })
      if (user.discountLimitBp === discountLimitBp) return
      await manager.update(User, { id: user.id }, { discountLimitBp })
      await recordAudit(manager, actor, 'user', user.id, 'discount-limit-changed', { email: user.email, discountLimitBp: { before: user.discountLimitBp, after: discountLimitBp } })
    })
    return this.get(id)
  }

  private async lockUser(manager: EntityManager, id: string): Promise<User> {
    const user = await manager.findOne(User, { where: { id }, lock: { mode: 'pessimistic_write' } })
    if (!user) throw new NotFoundError('User')
    return user
  }

  /**
   * Locks the user's row; for an admin, first the rows of every enabled admin, always in the same
   * order, so two admins demoting each other at once queue instead of deadlocking.
   */
  private async lockUserGuardingAdmins(manager: EntityManager, id: string): Promise<User> {
    const peek = await manager.findOneBy(User, { id })
    if (!peek) throw new NotFoundError('User')
    if (peek.role === 'admin') await this.lockAdmins(manager)
    return this.lockUser(manager, id)
  }

  private lockAdmins(manager: EntityManager): Promise<User[]> {
    return manager.find(User, { where: { role: 'admin', disabledAt: IsNull() }, order: { id: 'ASC' }, lock: { mode: 'pessimistic_write' } })
  }

  /** Refuses a change that would leave no enabled admin who can sign in. */
  private async ensureAnotherAdmin(manager: EntityManager, leavingId: string): Promise<void> {
    const admins = await this.lockAdmins(manager)
    if (!admins.some((admin) => admin.id !== leavingId && admin.passwordHash !== null)) {
      throw new ConflictError('This is the last administrator who can sign in; make someone else an admin first', 'last_admin')
    }
  }

  private row(user: User, invitationExpiresAt: string | null): AdminUserRow {
    return {
      id: user.id,
      email: user.email,
      name: user.name,
      role: user.role,
      organisation: user.organisation.name,
      organisationId: user.organisationId,
      disabled: user.disabledAt !== null,
      status: statusOf(user),
      discountLimitBp: user.discountLimitBp,
      invitationExpiresAt,
      createdAt: user.createdAt.toISOString(),
    }
  }
}
