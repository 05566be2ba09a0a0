// Helpers shared by the administration API tests: reading invitation links out of the outbox.
import type { DataSource } from 'typeorm'
import { MailOutbox } from '../../server/db/entities'

/** The token in the newest invitation mail to `userId` (the link only exists in the mail). */
export async function latestInvitationToken(dataSource: DataSource, userId: string): Promise<string> {
  const mail = await dataSource.getRepository(MailOutbox).findOne({ where: { kind: 'user-invitation', reference: userId }, order: { createdAt: 'DESC' } })
  const token = mail?.text.match(/\/set-password\/([A-Za-z0-9_-]{43})/)?.[1]
  if (!token) throw new Error(`no invitation mail for user ${userId}`)
  return token
}

export async function invitationMails(dataSource: DataSource, userId: string): Promise<MailOutbox[]> {
  return dataSource.getRepository(MailOutbox).find({ where: { kind: 'user-invitation', reference: userId }, order: { createdAt: 'ASC' } })
}
