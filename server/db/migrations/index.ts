import { Foundation1764626400000 } from './1764626400000-foundation'
import { CatalogueStudies1764630000000 } from './1764630000000-catalogue-studies'
import { Quotes1764633600000 } from './1764633600000-quotes'
import { MailOutbox1764637200000 } from './1764637200000-mail-outbox'
import { Invitations1764644400000 } from './1764644400000-invitations'
import { ImportsDatasheets1764648000000 } from './1764648000000-imports-datasheets'

/** Every migration in order; the data source takes the classes, not a glob. */
export const migrations = [Foundation1764626400000, CatalogueStudies1764630000000, Quotes1764633600000, MailOutbox1764637200000, Invitations1764644400000, ImportsDatasheets1764648000000]
