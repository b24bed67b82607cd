// The imports area's public face: what the routes, workers and other areas may use. The files
// behind it go by concept: mappings, uploadBenchFile, dryRun (with planRows), importRun,
// importJobs (progress, counts, the sweeper's list) and importDto (what the screen shows).
export * from './benchCsv'
export { checkImport, requestDryRun } from './dryRun'
export { getImport, listImportRows, listImports, toImportDto } from './importDto'
export { failImport, pendingImports } from './importJobs'
export type { PendingImport } from './importJobs'
export { processImport, requestImportRun } from './importRun'
export { getImportMapping, saveImportMapping, stationChecks } from './mappings'
export { planRows } from './planRows'
export type { RowPlan } from './planRows'
export * from './queue'
export { uploadBenchFile } from './uploadBenchFile'
