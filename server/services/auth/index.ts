// The auth area's public face: what the routes, workers and other areas may use.
export * from './auth'
export * from './countersign'
export * from './passwords'
export * from './sessions'
export { forgetUsers, isAuthCacheLive } from './authCache'
export * from './sessionStore'
