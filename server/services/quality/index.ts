// The quality area's public face: what the routes, workers and other areas may use.
export * from './alertQueue'
export * from './alerts'
export * from './containment'
export * from './nonconformances'
export * from './turnDeviation'
export * from './yield'
export * from './yieldDetail'
export * from './yieldQueries'
