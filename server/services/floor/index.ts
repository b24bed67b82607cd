// The floor area's public face: what the routes, workers and other areas may use.
export * from './floor'
export * from './stepPlans'
export * from './stepRuns'
