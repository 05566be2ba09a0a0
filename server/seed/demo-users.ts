// Demo organisations and sign-ins of the invented Ashcombe scenario (DESIGN.md "Demo scenario").
import type { EntityManager } from 'typeorm'
import { Organisation, User } from '../db/entities'
import { hashPassword } from '../services/user.service'

export const DEMO_PASSWORD = 'Spinwright-demo-1'

export const DEMO_ORGANISATIONS = [
  { name: 'Ashcombe Motor Works', kind: 'maker', tier: null, currency: 'USD' },
  { name: 'Larkspur Air Appliances', kind: 'customer', tier: 'oem', currency: 'USD' },
  { name: 'Quillon Supply', kind: 'customer', tier: 'distributor', currency: 'USD' },
] as const

export const DEMO_USERS = [
  { email: 'admin@ashcombe.test', name: 'Maren Holt', role: 'admin', organisation: 'Ashcombe Motor Works' },
  { email: 'sales@ashcombe.test', name: 'Tobias Wren', role: 'sales', organisation: 'Ashcombe Motor Works' },
  { email: 'buyer@larkspur.test', name: 'Priya Castellan', role: 'buyer', organisation: 'Larkspur Air Appliances' },
  { email: 'buyer@quillon.test', name: 'Dario Fenn', role: 'buyer', organisation: 'Quillon Supply' },
] as const

export async function seedDemoUsers(manager: EntityManager): Promise<void> {
  const byName = new Map<string, Organisation>()
  for (const spec of DEMO_ORGANISATIONS) {
    let organisation = await manager.findOneBy(Organisation, { name: spec.name })
    organisation ??= await manager.save(manager.create(Organisation, { ...spec }))
    byName.set(spec.name, organisation)
  }
  const passwordHash = await hashPassword(DEMO_PASSWORD)
  for (const spec of DEMO_USERS) {
    if (await manager.existsBy(User, { email: spec.email })) continue
    const organisation = byName.get(spec.organisation)
    if (!organisation) throw new Error(`demo organisation ${spec.organisation} missing`)
    await manager.save(
      manager.create(User, {
        email: spec.email,
        name: spec.name,
        role: spec.role,
        passwordHash,
        organisationId: organisation.id,
        units: spec.role === 'buyer' && spec.organisation === 'Larkspur Air Appliances' ? 'us' : 'si',
      }),
    )
  }
}
