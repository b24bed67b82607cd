// The lots area's public face: what the routes, workers and other areas may use.
export * from './lotGrid'
export * from './lots'
