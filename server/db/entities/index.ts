import { AuditEntry } from './audit-entry.entity'
import { CatalogueRevision } from './catalogue-revision.entity'
import { DemoFan } from './demo-fan.entity'
import { DutyStudy } from './duty-study.entity'
import { Invitation } from './invitation.entity'
import { MailOutbox } from './mail-outbox.entity'
import { MotorFamily } from './motor-family.entity'
import { MotorPerformance } from './motor-performance.entity'
import { MotorVariant } from './motor-variant.entity'
import { Organisation } from './organisation.entity'
import { AccountTerms, CopperIndexRecord, PriceListEntryRecord, PriceListRecord } from './pricing.entities'
import { DepositPayment, PaymentEvent, QuoteAcceptance, QuoteRecordEntity, QuoteRevisionRecord, QuoteSequence, SalesOrder } from './quote.entities'
import { SeedMarker } from './seed-marker.entity'
import { SessionRecord } from './session-record.entity'
import { StudyRun } from './study-run.entity'
import { User } from './user.entity'
import { Datasheet } from './datasheet.entity'
import { ImportBatch } from './import-batch.entity'

export {
  AccountTerms,
  CopperIndexRecord,
  PriceListEntryRecord,
  PriceListRecord,
  DepositPayment,
  PaymentEvent,
  QuoteAcceptance,
  QuoteRecordEntity,
  QuoteRevisionRecord,
  QuoteSequence,
  SalesOrder,
  MailOutbox,
  Invitation,
  Datasheet,
  ImportBatch,
  AuditEntry, CatalogueRevision, DemoFan, DutyStudy, MotorFamily, MotorPerformance, MotorVariant, Organisation, SeedMarker, SessionRecord, StudyRun, User }

/** Every entity, listed explicitly so nothing depends on a file glob matching compiled output. */
export const entities = [
  Organisation,
  User,
  SessionRecord,
  AuditEntry,
  SeedMarker,
  MotorFamily,
  MotorVariant,
  MotorPerformance,
  DemoFan,
  CatalogueRevision,
  DutyStudy,
  StudyRun,
  PriceListRecord,
  PriceListEntryRecord,
  CopperIndexRecord,
  AccountTerms,
  QuoteRecordEntity,
  QuoteRevisionRecord,
  QuoteSequence,
  QuoteAcceptance,
  DepositPayment,
  PaymentEvent,
  SalesOrder,
  MailOutbox,
  Invitation,
  Datasheet,
  ImportBatch,
]
