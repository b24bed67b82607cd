// The units area's public face: a unit's summary and the moves made off the scan (rework, scrap)
// by a nonconformance's disposition, a containment and a service case. It imports no other area,
// so the floor, quality and the service desk can all use it.
export * from './unitMoves'
