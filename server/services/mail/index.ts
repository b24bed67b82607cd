// The mail area's public face: what the routes, workers and other areas may use.
export * from './documentEmail'
export * from './mailDelivery'
export * from './outbox'
export * from './queue'
export * from './retryEmail'
