// Builds the Express application (API + built SPA) apart from listen(), so tests run it in-process.
import path from 'node:path'
import { existsSync } from 'node:fs'
import compression from 'compression'
import express, { type Express } from 'express'
import session from 'express-session'
import helmet from 'helmet'
import type { DataSource } from 'typeorm'
import type { Config } from './config'
import { createPassport } from './auth/passport'
import { csrfGuard } from './auth/csrf'
import { sessionLayer } from './auth/session-layer'
import { TypeormSessionStore } from './auth/session-store'
import type { ApiRouter, RouteEntry } from './http/api-router'
import { apiNotFound, errorHandler } from './http/error-handler'
import { adminUserRoutes } from './routes/admin-users.routes'
import { adminOrganisationRoutes } from './routes/admin-organisations.routes'
import { adminPricingRoutes } from './routes/admin-pricing.routes'
import { adminAuditRoutes } from './routes/admin-audit.routes'
import { invitationRoutes } from './routes/invitation.routes'
import { AdminUserService } from './services/admin-users.service'
import { AdminOrganisationService } from './services/admin-organisations.service'
import { AdminPricingService } from './services/admin-pricing.service'
import { AdminAuditService } from './services/admin-audit.service'
import { InvitationService } from './services/invitation.service'
import { adminMailboxRoutes } from './routes/admin-mailbox.routes'
import { MailboxClient } from './mail/mailbox-client'
import { authRoutes } from './routes/auth.routes'
import { catalogueRoutes } from './routes/catalogue.routes'
import { studyRoutes } from './routes/study.routes'
import { CatalogueService } from './services/catalogue.service'
import { StudyService } from './services/study.service'
import { QuoteService } from './services/quote.service'
import { outboxQuoteMailer } from './services/quote-mailer'
import { quoteRoutes } from './routes/quote.routes'
import { renderQuotePdf } from './documents/quote-pdf'
import { portalUrlFrom } from './mail/templates'
import { healthRoutes } from './routes/health.routes'
import { UserService } from './services/user.service'
import { createPaymentServices, paymentWebhookHandler, WEBHOOK_PATH } from './payments'
import { orderRoutes } from './routes/order.routes'
import { paymentRoutes } from './routes/payment.routes'
import { adminCatalogueRoutes, datasheetDownloadRoutes } from './routes/admin-catalogue.routes'
import { fanCurveRoutes } from './routes/fan-curve.routes'
import { CatalogueImportService } from './imports/catalogue-import.service'
import { PerformanceUploadService } from './imports/performance-upload.service'
import { DatasheetService } from './files/datasheet.service'
import { SelectionPool, defaultSelectionWorkers } from './selection/selection-pool'

export interface AppDeps {
  config: Config
  dataSource: DataSource
  /** Folder of the built SPA; omitted in API tests. */
  clientDir?: string
  log?: (error: unknown) => void
  /** Today's date as YYYY-MM-DD; tests move it to check validity and expiry. */
  today?: () => string
  /** Reader of the captured mailbox; defaults to the fake mail server at MAILBOX_URL. */
  mailbox?: MailboxClient
}

export interface AppHandle {
  app: Express
  services: { catalogue: CatalogueService; studies: StudyService; quotes: QuoteService }
  routes: RouteEntry[]
  sessionStore: TypeormSessionStore
  close(): void
}

export const SESSION_COOKIE = 'spinwright.sid'
// Routes that prove themselves another way (signed payment webhooks) skip the CSRF check.
const CSRF_EXEMPT = new Set<string>(['/payments/webhook'])
/** Reads that start a session when they come without one (the CSRF token lives in it). */
const SESSION_STARTERS = new Set<string>(['/auth/csrf'])

export function createApp({ config, dataSource, clientDir, log = console.error, today, mailbox = new MailboxClient(config.MAILBOX_URL) }: AppDeps): AppHandle {
  const app = express()
  app.disable('x-powered-by')
  app.set('trust proxy', config.TRUST_PROXY ? 1 : false)
  // No body-hash ETags on API answers (a SHA-1 of every body); static files keep their own.
  app.set('etag', false)

  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          defaultSrc: ["'self'"],
          scriptSrc: ["'self'"],
          // Vuetify writes its theme variables into a <style> element at run time.
          styleSrc: ["'self'", "'unsafe-inline'"],
          imgSrc: ["'self'", 'data:', 'blob:'],
          fontSrc: ["'self'", 'data:'],
          connectSrc: ["'self'"],
          objectSrc: ["'none'"],
          frameAncestors: ["'none'"],
          formAction: ["'self'"],
          upgradeInsecureRequests: null,
        },
      },
      // Plain-http loopback serving must not be told to switch to https.
      strictTransportSecurity: config.COOKIE_SECURE === 'true',
    }),
  )

  // Answers compressed for clients that accept it (every browser): the demo study's 281 KB of
  // JSON go out as 57 KB for about 4 ms of gzip at level 1. Off behind a proxy that compresses
  // (COMPRESS_RESPONSES=false). PDFs and images are left as they are.
  if (config.COMPRESS_RESPONSES) app.use(compression({ level: 1, threshold: 1024 }))

  const users = new UserService(dataSource)
  const adminUsers = new AdminUserService(dataSource, portalUrlFrom(config))
  const adminOrganisations = new AdminOrganisationService(dataSource)
  const adminPricing = new AdminPricingService(dataSource, today)
  const adminAudit = new AdminAuditService(dataSource)
  const invitations = new InvitationService(dataSource)
  const catalogue = new CatalogueService(dataSource)
  const selectionWorkers = config.SELECTION_WORKERS ?? defaultSelectionWorkers()
  const selectionPool = selectionWorkers > 0 ? new SelectionPool(selectionWorkers) : undefined
  const studies = new StudyService(dataSource, catalogue, { pool: selectionPool, poolMinVariants: config.SELECTION_POOL_MIN_VARIANTS, log })
  const datasheets = new DatasheetService(dataSource, config.DATA_DIR, log)
  const quotes = new QuoteService({
    dataSource,
    catalogue,
    dataDir: path.resolve(config.DATA_DIR),
    publicUrl: portalUrlFrom(config),
    renderPdf: renderQuotePdf,
    mailer: outboxQuoteMailer(portalUrlFrom(config)),
    today,
  })
  const payments = createPaymentServices(config, dataSource, log)
  const passport = createPassport(users)
  const sessionStore = new TypeormSessionStore(dataSource)
  // The signature covers the raw bytes: this route gets its own parser, ahead of the API router's JSON one.
  app.post(WEBHOOK_PATH, express.raw({ type: 'application/json', limit: '256kb' }), paymentWebhookHandler(payments.webhooks))
  const api = express.Router()
  api.use(express.json({ limit: '1mb' }))
  const sessionMiddleware = session({
    name: SESSION_COOKIE,
    secret: config.SESSION_SECRET,
    store: sessionStore,
    resave: false,
    saveUninitialized: false,
    rolling: true,
    cookie: {
      httpOnly: true,
      sameSite: 'lax',
      secure: config.COOKIE_SECURE === 'auto' ? 'auto' : config.COOKIE_SECURE === 'true',
      maxAge: 8 * 60 * 60 * 1000,
    },
  })
  api.use(sessionLayer(SESSION_COOKIE, (requestPath) => SESSION_STARTERS.has(requestPath), [sessionMiddleware, passport.session()]))
  api.use(csrfGuard((requestPath) => CSRF_EXEMPT.has(requestPath)))

  const routers: ApiRouter[] = [
    healthRoutes(dataSource),
    authRoutes({
      passport,
      users,
      limits: {
        perIp: config.SIGNIN_LIMIT_PER_IP,
        perAccount: config.SIGNIN_LIMIT_PER_ACCOUNT,
        windowMinutes: config.SIGNIN_WINDOW_MINUTES,
      },
    }),
    adminUserRoutes(adminUsers),
    adminOrganisationRoutes(adminOrganisations),
    adminPricingRoutes(adminPricing),
    adminAuditRoutes(adminAudit),
    invitationRoutes(invitations),
    adminMailboxRoutes(dataSource, mailbox),
    catalogueRoutes(catalogue),
    datasheetDownloadRoutes(datasheets),
    adminCatalogueRoutes({ imports: new CatalogueImportService(dataSource), performance: new PerformanceUploadService(dataSource), datasheets }),
    fanCurveRoutes(),
    studyRoutes(studies),
    quoteRoutes(quotes, dataSource),
    paymentRoutes(payments.deposits),
    orderRoutes(payments.orders),
  ]
  for (const router of routers) api.use(router.prefix || '/', router.router)
  api.use(apiNotFound)
  app.use('/api', api)

  if (clientDir && existsSync(path.join(clientDir, 'index.html'))) {
    app.use(express.static(clientDir, { index: false, maxAge: '1h' }))
    // History-mode SPA: any other GET that wants HTML gets index.html.
    app.get('/{*splat}', (req, res, next) => {
      if (!req.accepts('html')) return next()
      res.setHeader('Cache-Control', 'no-cache')
      // `root` keeps send's dot-file rule to the file's own name: the folder may sit under .data/.
      res.sendFile('index.html', { root: clientDir })
    })
  }
  app.use(errorHandler(log))

  return {
    app,
    services: { catalogue, studies, quotes },
    routes: routers.flatMap((router) => router.routes.map((route) => ({ ...route, path: `/api${route.path}` }))),
    sessionStore,
    close: () => {
      sessionStore.close()
      void selectionPool?.close()
    },
  }
}
