// Invitations: a set-password link with a random token (only its SHA-256 is stored) that expires,
// works once, and is replaced by a newer one when an admin resends it.
import { createHash, randomBytes } from 'node:crypto'
import { IsNull, type DataSource, type EntityManager } from 'typeorm'
import { INVITATION_HOURS, type InvitationInfo, type SetPasswordResult } from '../../shared/contracts/admin.contract'
import { Invitation, Organisation, SessionRecord, User } from '../db/entities'
import { AppError, NotFoundError } from '../http/errors'
import { enqueueMail } from '../mail/outbox'
import { invitationMail } from '../mail/invitation-template'
import { formatInstant } from '../mail/templates'
import { recordAudit } from './admin-audit.service'
import { hashPassword } from './user.service'

export function hashToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex')
}

/** 32 random bytes as base64url: 43 characters, 256 bits. */
export function newInvitationToken(): string {
  return randomBytes(32).toString('base64url')
}

export class InvitationGoneError extends AppError {
  constructor(code: 'invitation_expired' | 'invitation_used' | 'invitation_replaced' | 'account_disabled', message: string) {
    super(410, code, message)
  }
}

export interface IssueInvitationInput {
  user: User
  organisationName: string
  invitedBy: { id: string; name: string; email: string }
  portalUrl: string
  now?: Date
}

/**
 * Replaces any open invitation of the user with a new one and puts the e-mail in the outbox, all
 * with the caller's `manager` (the same transaction as the change that asked for it).
 */
export async function issueInvitation(manager: EntityManager, input: IssueInvitationInput): Promise<Invitation> {
  const now = input.now ?? new Date()
  await manager.update(Invitation, { userId: input.user.id, usedAt: IsNull(), revokedAt: IsNull() }, { revokedAt: now })
  const token = newInvitationToken()
  const expiresAt = new Date(now.getTime() + INVITATION_HOURS * 60 * 60 * 1000)
  const invitation = await manager.save(
    manager.create(Invitation, { userId: input.user.id, tokenHash: hashToken(token), expiresAt, usedAt: null, revokedAt: null, createdById: input.invitedBy.id }),
  )
  await enqueueMail(
    manager,
    invitationMail({
      portalUrl: input.portalUrl,
      token,
      invitee: { name: input.user.name, email: input.user.email },
      invitedBy: input.invitedBy,
      organisationName: input.organisationName,
      role: input.user.role,
      expiresAt,
      userId: input.user.id,
    }),
    now,
  )
  return invitation
}

export class InvitationService {
  constructor(
    private readonly dataSource: DataSource,
    private readonly now: () => Date = () => new Date(),
  ) {}

  /** The invitation behind a link, or the reason it no longer works. */
  async check(token: string): Promise<InvitationInfo> {
    const { invitation, user } = await this.usable(this.dataSource.manager, token)
    const organisation = await this.dataSource.manager.findOneByOrFail(Organisation, { id: user.organisationId })
    return { email: user.email, name: user.name, organisation: organisation.name, expiresAt: invitation.expiresAt.toISOString() }
  }

  /** Sets the password through a link; the link is then used up. The person signs in afterwards. */
  async setPassword(token: string, password: string): Promise<SetPasswordResult> {
    // Refuse a dead link before spending the hashing time; checked again under the row lock.
    await this.usable(this.dataSource.manager, token)
    const passwordHash = await hashPassword(password)
    return this.dataSource.transaction(async (manager) => {
      const { invitation, user } = await this.usable(manager, token, true)
      const now = this.now()
      await manager.update(Invitation, { id: invitation.id }, { usedAt: now })
      await manager.update(User, { id: user.id }, { passwordHash })
      // Any session held under this account predates the new password.
      await manager.delete(SessionRecord, { userId: user.id })
      await recordAudit(manager, { id: user.id, email: user.email }, 'user', user.id, 'password-set', { invitationId: invitation.id, via: 'invitation' })
      return { email: user.email }
    })
  }

  private async usable(manager: EntityManager, token: string, lock = false): Promise<{ invitation: Invitation; user: User }> {
    const where = { tokenHash: hashToken(token) }
    const invitation = lock ? await manager.findOne(Invitation, { where, lock: { mode: 'pessimistic_write' } }) : await manager.findOneBy(Invitation, where)
    if (!invitation) throw new NotFoundError('Invitation')
    const user = await manager.findOneBy(User, { id: invitation.userId })
    if (!user) throw new NotFoundError('Invitation')
    if (invitation.usedAt) {
      throw new InvitationGoneError('invitation_used', 'This link has already been used to set a password. Sign in with that password, or ask an administrator for a new link.')
    }
    if (invitation.revokedAt) {
      throw new InvitationGoneError('invitation_replaced', 'A newer invitation has been sent for this account; use the link in the latest e-mail.')
    }
    if (user.disabledAt) throw new InvitationGoneError('account_disabled', 'This account has been disabled; ask an administrator.')
    if (invitation.expiresAt.getTime() <= this.now().getTime()) {
      throw new InvitationGoneError('invitation_expired', `This invitation link expired on ${formatInstant(invitation.expiresAt)}. Ask the administrator who invited you to send a new one.`)
    }
    return { invitation, user }
  }
}
