// The search area's public face: the top bar's one box over every kind of record.
export * from './search'
