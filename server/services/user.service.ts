import bcrypt from 'bcryptjs'
import type { DataSource } from 'typeorm'
import type { SessionUser, UnitSystem } from '../../shared/contracts/auth.contract'
import { User } from '../db/entities'

export const BCRYPT_COST = 12
// Compared against when the e-mail is unknown, so both failures take the same time.
const DUMMY_HASH = bcrypt.hashSync('not-a-real-password', BCRYPT_COST)

export function toSessionUser(user: User): SessionUser {
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    role: user.role,
    units: user.units,
    organisation: {
      id: user.organisation.id,
      name: user.organisation.name,
      kind: user.organisation.kind,
      tier: user.organisation.tier,
    },
  }
}

export class UserService {
  constructor(private readonly dataSource: DataSource) {}

  private get users() {
    return this.dataSource.getRepository(User)
  }

  async findActiveById(id: string): Promise<User | null> {
    const user = await this.users.findOne({ where: { id }, relations: { organisation: true } })
    return user && !user.disabledAt ? user : null
  }

  /** The user when e-mail and password match an enabled account, else null (no hint which part failed). */
  async verifyCredentials(email: string, password: string): Promise<User | null> {
    const user = await this.users.findOne({ where: { email: email.toLowerCase() }, relations: { organisation: true } })
    const ok = await bcrypt.compare(password, user?.passwordHash ?? DUMMY_HASH)
    if (!ok || !user || !user.passwordHash || user.disabledAt) return null
    return user
  }

  async setUnits(id: string, units: UnitSystem): Promise<void> {
    await this.users.update({ id }, { units })
  }
}

export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, BCRYPT_COST)
}
