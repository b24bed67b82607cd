// The trace area's public face: what the routes, workers and other areas may use.
export * from './recall'
export * from './trace'
export * from './traceQueries'
