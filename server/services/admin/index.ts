// The admin area's public face: what the routes, workers and other areas may use.
// Audit writing lives in services/audit (below auth); admin's face keeps offering it.
export * from '../audit'
export * from './auditLog'
export * from './health'
export * from './stations'
export * from './users'
export * from './badges'
