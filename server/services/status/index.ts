// The status area's public face: the admin's view of the running system.
export * from './status'
