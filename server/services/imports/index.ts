// The imports area's public face: what the routes, workers and other areas may use.
export * from './benchCsv'
export * from './imports'
export * from './queue'
