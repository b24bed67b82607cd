import { csrfSync } from 'csrf-sync'

// Synchronizer tokens kept in the session: the client reads one from GET /api/auth/csrf and sends
// it back in X-CSRF-Token on every state-changing request. Signing in regenerates the session, so
// the client fetches a fresh token afterwards.
export const { csrfSynchronisedProtection: csrfProtection, generateToken: csrfToken } = csrfSync({
  getTokenFromRequest: (req) => {
    const header = req.headers['x-csrf-token']
    return typeof header === 'string' ? header : undefined
  },
  errorConfig: {
    statusCode: 403,
    code: 'csrf_invalid',
    message: 'the form expired: reload the page and try again',
  },
})
