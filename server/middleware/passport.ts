import passport from 'passport'
import { Strategy as LocalStrategy } from 'passport-local'
import type { UserDto } from '../../shared/schemas/auth'
import { authenticate } from '../services/auth'
import { sessionPool } from './session'

// The session stores only the user id; the user is read again on every request, so a role
// change or a deactivation takes effect at once. Every signed-in request pays for this read,
// so it is one plain query on the session pool rather than an ORM look-up.
passport.serializeUser((user, done) => done(null, (user as UserDto).id))
passport.deserializeUser((id: string, done) => {
  sessionPool()
    .query<UserDto>({
      name: 'session-user',
      text: 'SELECT id, email, name, role FROM users WHERE id = $1 AND is_active',
      values: [id],
    })
    .then(
      (result) => done(null, result.rows[0] ?? false),
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
