// Builds the Express application (API + built SPA) apart from listen(), so tests run it in-process.
import path from 'node:path'
import { existsSync } from 'node:fs'
import express, { type Express } from 'express'
import session from 'express-session'
import helmet from 'helmet'
import type { DataSource } from 'typeorm'
import type { Config } from './config'
import { createPassport } from './auth/passport'
import { csrfGuard } from './auth/csrf'
import { TypeormSessionStore } from './auth/session-store'
import type { ApiRouter, RouteEntry } from './http/api-router'
import { apiNotFound, errorHandler } from './http/error-handler'
import { adminUserRoutes } from './routes/admin-users.routes'
import { authRoutes } from './routes/auth.routes'
import { catalogueRoutes } from './routes/catalogue.routes'
import { studyRoutes } from './routes/study.routes'
import { CatalogueService } from './services/catalogue.service'
import { StudyService } from './services/study.service'
import { healthRoutes } from './routes/health.routes'
import { UserService } from './services/user.service'

export interface AppDeps {
  config: Config
  dataSource: DataSource
  /** Folder of the built SPA; omitted in API tests. */
  clientDir?: string
  log?: (error: unknown) => void
}

export interface AppHandle {
  app: Express
  services: { catalogue: CatalogueService; studies: StudyService }
  routes: RouteEntry[]
  sessionStore: TypeormSessionStore
  close(): void
}

export const SESSION_COOKIE = 'spinwright.sid'
// Routes that prove themselves another way (signed payment webhooks) skip the CSRF check.
const CSRF_EXEMPT = new Set<string>(['/payments/webhook'])

export function createApp({ config, dataSource, clientDir, log = console.error }: AppDeps): AppHandle {
  const app = express()
  app.disable('x-powered-by')
  app.set('trust proxy', config.TRUST_PROXY ? 1 : false)

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

  const users = new UserService(dataSource)
  const catalogue = new CatalogueService(dataSource)
  const studies = new StudyService(dataSource, catalogue)
  const passport = createPassport(users)
  const sessionStore = new TypeormSessionStore(dataSource)
  const api = express.Router()
  api.use(express.json({ limit: '1mb' }))
  api.use(
    session({
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
    }),
  )
  api.use(passport.session())
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
    adminUserRoutes(dataSource),
    catalogueRoutes(catalogue),
    studyRoutes(studies),
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
      res.sendFile(path.join(clientDir, 'index.html'))
    })
  }
  app.use(errorHandler(log))

  return {
    app,
    services: { catalogue, studies },
    routes: routers.flatMap((router) => router.routes.map((route) => ({ ...route, path: `/api${route.path}` }))),
    sessionStore,
    close: () => sessionStore.close(),
  }
}
