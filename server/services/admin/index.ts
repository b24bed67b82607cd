// The admin area's public face: what the routes, workers and other areas may use.
export * from './audit'
export * from './auditLog'
export * from './health'
export * from './stations'
export * from './users'
export * from './badges'
