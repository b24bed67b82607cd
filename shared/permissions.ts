import type { Role } from './roles'

/**
 * Who may do what, in one place: the server's route guards and the client's edit buttons both
 * read these lists, so a screen never offers what the API will refuse.
 */
export const PERMISSIONS = {
  editRecipes: ['engineer'],
  readReleaseCheck: ['engineer', 'lead', 'admin'],
  /**
   * Draft revisions and their bills of materials: the engineers who write them, and the lead and
   * admin, who already see what stops a release. Everyone signed in reads released and obsolete
   * revisions (what is built and was built).
   */
  readDraftRecipes: ['engineer', 'lead', 'admin'],
  readParts: ['engineer', 'stores', 'lead', 'admin'],
  editParts: ['engineer', 'stores'],
  editDefectCodes: ['engineer'],
  readComponentLots: ['stores', 'lead', 'admin', 'engineer', 'service'],
  editComponentLots: ['stores'],
  setComponentLotStatus: ['stores', 'lead'],
  printLotLabels: ['stores', 'lead', 'admin'],
  readLots: ['lead', 'engineer', 'admin', 'service'],
  editLots: ['lead'],
  useFloor: ['operator', 'lead', 'engineer', 'admin'],
  recordStepRuns: ['operator', 'lead', 'engineer'],
  readNonconformances: ['lead', 'engineer', 'admin', 'service'],
  disposeNonconformances: ['lead', 'engineer'],
  readOutbox: ['admin', 'service'],
  readYield: ['lead', 'engineer', 'admin'],
  readAlerts: ['lead', 'engineer', 'admin'],
  acknowledgeAlerts: ['lead'],
  importBenchData: ['lead', 'engineer'],
  readCustomers: ['lead', 'service', 'admin', 'engineer'],
  editCustomers: ['lead', 'service', 'admin'],
  readShipments: ['lead', 'service', 'admin', 'engineer'],
  createShipments: ['lead', 'service'],
  /** Make a certificate of conformance or a packing slip, and e-mail one to a customer. */
  issueCustomerDocuments: ['service', 'lead', 'admin'],
  /** E-mail a lot report. */
  emailLotReports: ['lead', 'engineer', 'admin'],
  readServiceCases: ['service', 'lead', 'engineer', 'admin'],
  editServiceCases: ['service', 'lead'],
  traceUnits: ['service', 'lead', 'engineer', 'admin'],
  containComponentLots: ['lead'],
  sendDraftEmails: ['service', 'admin'],
  /** Send again an e-mail the relay refused until its last attempt. */
  retryEmails: ['admin', 'service'],
} as const satisfies Record<string, readonly Role[]>

export type Permission = keyof typeof PERMISSIONS

/** Whether a role holds a permission. */
export function can(role: Role | undefined, permission: Permission): boolean {
  return role !== undefined && (PERMISSIONS[permission] as readonly Role[]).includes(role)
}
