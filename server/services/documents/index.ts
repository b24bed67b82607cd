// The documents area's public face: what the routes, workers and other areas may use.
export * from './documentRender'
export * from './documents'
export * from './lotReportData'
export * from './queue'
