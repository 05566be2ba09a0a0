import { AuditEntry } from './audit-entry.entity'
import { Organisation } from './organisation.entity'
import { SeedMarker } from './seed-marker.entity'
import { SessionRecord } from './session-record.entity'
import { User } from './user.entity'

export { AuditEntry, Organisation, SeedMarker, SessionRecord, User }

/** Every entity, listed explicitly so nothing depends on a file glob matching compiled output. */
export const entities = [Organisation, User, SessionRecord, AuditEntry, SeedMarker]
