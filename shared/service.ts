/** Resolutions of a service case (a returned unit), DESIGN.md §5 step 7. */
export const SERVICE_CASE_RESOLUTIONS = ['repair', 'replace', 'credit', 'no_fault_found'] as const
export type ServiceCaseResolution = (typeof SERVICE_CASE_RESOLUTIONS)[number]

export const SERVICE_CASE_RESOLUTION_LABELS: Record<ServiceCaseResolution, string> = {
  repair: 'Repair (rework route)',
  replace: 'Replace with another serial',
  credit: 'Credit',
  no_fault_found: 'No fault found',
}

export const SERVICE_CASE_STATUSES = ['open', 'closed'] as const
export type ServiceCaseStatus = (typeof SERVICE_CASE_STATUSES)[number]
