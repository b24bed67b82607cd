// The audit area's public face: `recordAudit` and the `Actor` every state change names, and the
// shapes of an audited write (auditedWrites.ts). It is the lowest area (models only), so that
// every other one, auth included, can write the audit log.
export * from './audit'
export * from './auditedWrites'
