import passport from 'passport'
import { Strategy as LocalStrategy } from 'passport-local'
import type { UserDto } from '../../shared/schemas/auth'
import { authenticate } from '../services/auth'
import { sqlPool } from '../db/pool'
import { namedSql } from '../db/txSql'
import { cachedUser } from './authCache'

// The session stores only the user id; the user is read again for every request, so a role
// change or a deactivation takes effect at once. The read goes through the auth cache, which
// PostgreSQL's notifications keep in step with every change (authCache.ts).
const SESSION_USER = namedSql(
  'session-user',
  'SELECT id, email, name, role FROM users WHERE id = $1 AND is_active',
)

passport.serializeUser((user, done) => done(null, (user as UserDto).id))
passport.deserializeUser((id: string, done) => {
  cachedUser(id, async () => {
    const result = await sqlPool().query<UserDto>({ ...SESSION_USER, values: [id] })
    return result.rows[0] ?? null
  }).then(
    (user) => done(null, user ? { ...user } : false),
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
