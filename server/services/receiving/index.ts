// The receiving area's public face: what the routes, workers and other areas may use.
export * from './componentLots'
export * from './uploads'
export * from './suppliers'
