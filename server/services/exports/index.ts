// The exports area's public face: what the routes, workers and other areas may use.
export * from './exports'
