import passport from 'passport'
import { Strategy as LocalStrategy } from 'passport-local'
import type { SessionUser } from '../../shared/contracts/auth.contract'
import { toSessionUser, type UserService } from '../services/user.service'

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    // passport's req.user is our signed-in user.
    interface User extends SessionUser {}
  }
}

/** A passport instance of our own (not the global singleton) so tests can build several apps. */
export function createPassport(users: UserService): passport.PassportStatic {
  const instance = new passport.Passport()
  instance.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password', session: true }, (email, password, done) => {
      users
        .verifyCredentials(email, password)
        .then((user) => done(null, user ? toSessionUser(user) : false))
        .catch((error: unknown) => done(error))
    }),
  )
  instance.serializeUser((user, done) => done(null, user.id))
  // Loaded on every request, so a disabled account or a changed role takes effect at once.
  instance.deserializeUser((id: unknown, done) => {
    if (typeof id !== 'string') return done(null, false)
    users
      .findActiveById(id)
      .then((user) => done(null, user ? toSessionUser(user) : false))
      .catch((error: unknown) => done(error))
  })
  return instance as passport.PassportStatic
}
