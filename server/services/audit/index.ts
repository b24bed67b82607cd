// The audit area's public face: `recordAudit` and the `Actor` every state change names. It is the
// lowest area (models only), so that every other one, auth included, can write the audit log.
export * from './audit'
