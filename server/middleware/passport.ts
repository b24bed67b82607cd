import passport from 'passport'
import { Strategy as LocalStrategy } from 'passport-local'
import type { UserDto } from '../../shared/schemas/auth'
import { authenticate, sessionUser } from '../services/auth'

// The session stores only the user id; the user is read again (through the auth cache) for every
// request, so a role change or a deactivation takes effect at once.
passport.serializeUser((user, done) => done(null, (user as UserDto).id))
passport.deserializeUser((id: string, done) => {
  sessionUser(id).then(
    (user) => done(null, user ?? false),
    (err: unknown) => done(err),
  )
})

passport.use(
  new LocalStrategy(
    { usernameField: 'email', passReqToCallback: true },
    (req, email, password, done) => {
      authenticate({ email, password }, { ip: req.ip ?? null, requestId: String(req.id) }).then(
        (user) => done(null, user ?? false),
        (err: unknown) => done(err),
      )
    },
  ),
)

export { passport }
