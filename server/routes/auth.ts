import type { Request, Response, NextFunction } from 'express'
import { LoginInput } from '../../shared/schemas/auth'
import { PinInput } from '../../shared/schemas/users'
import type { UserDto } from '../../shared/schemas/auth'
import { AppError } from '../errors'
import { actorOf, currentUser } from '../middleware/access'
import { csrfToken } from '../middleware/csrf'
import { passport } from '../middleware/passport'
import { ownPasswordLimiters, signInLimiters } from '../middleware/rateLimits'
import { parse } from '../middleware/validate'
import { issueBadge, setOwnPin } from '../services/admin'
import { recordSignOut } from '../services/auth'
import { apiRoutes } from './registry'

export const authRoutes = apiRoutes('/auth')

authRoutes.get('/csrf', 'public', (req, res) => {
  res.json({ csrfToken: csrfToken(req) })
})

// One text for every failure, so the answer does not tell whether the account exists.
const SIGN_IN_FAILED = 'e-mail or password is wrong'

authRoutes.post(
  '/login',
  'public',
  ...signInLimiters(),
  (req: Request, res: Response, next: NextFunction) => {
    req.body = parse(LoginInput, req.body)
    passport.authenticate('local', (err: unknown, user: UserDto | false) => {
      if (err) return next(err)
      if (!user) return next(new AppError(401, 'invalid_credentials', SIGN_IN_FAILED))
      // passport ≥ 0.6 regenerates the session here, which defeats session fixation.
      req.logIn(user, (loginErr) => (loginErr ? next(loginErr) : res.json({ user })))
    })(req, res, next)
  },
)

authRoutes.post('/logout', 'public', async (req, res, next) => {
  const actor = actorOf(req)
  if (currentUser(req)) await recordSignOut(actor)
  req.logOut((err) => {
    if (err) return next(err)
    req.session.destroy(() => {
      res.clearCookie('waymark.sid')
      res.status(204).end()
    })
  })
})

authRoutes.get('/me', 'signed_in', (req, res) => {
  res.json({ user: currentUser(req) })
})

/** Sets the signed-in person's own bench PIN, their password re-typed (counted like a sign-in). */
authRoutes.put('/pin', 'signed_in', ...ownPasswordLimiters(), async (req, res) => {
  res.json(await setOwnPin(actorOf(req), parse(PinInput, req.body)))
})

/** Prints the signed-in person's own badge. */
authRoutes.post('/badge', 'signed_in', async (req, res) => {
  const actor = actorOf(req)
  const pdf = await issueBadge(currentUser(req)!.id, actor)
  res.setHeader('Content-Disposition', 'attachment; filename="badge.pdf"')
  res.type('application/pdf').send(pdf)
})
