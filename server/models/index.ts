import { Sequelize } from 'sequelize'
import { CONNECT_TIMEOUT_MS, env, requireSetting } from '../env'
import { logger } from '../logger'
import { AuditEvent, initAuditEvent } from './AuditEvent'
import { BomLine, initBomLine } from './BomLine'
import { Check, initCheck } from './Check'
import { ComponentLot, initComponentLot } from './ComponentLot'
import { DefectCode, initDefectCode } from './DefectCode'
import { initPart, Part } from './Part'
import { initProduct, Product } from './Product'
import { initRevision, Revision } from './Revision'
import { initRouteStep, RouteStep } from './RouteStep'
import { initStation, Station } from './Station'
import { initUpload, Upload } from './Upload'
import { initUser, User } from './User'
import { initWinding, Winding } from './Winding'
import { initLot, Lot } from './Lot'
import { initUnit, Unit } from './Unit'
import { initStepRun, StepRun } from './StepRun'
import { initMeasurement, Measurement } from './Measurement'
import { Consumption, initConsumption } from './Consumption'
import { initNonconformance, Nonconformance } from './Nonconformance'
import { Document, initDocument } from './Document'
import { Email, initEmail } from './Email'
import { Customer, initCustomer } from './Customer'
import { initShipment, initShipmentUnit, Shipment, ShipmentUnit } from './Shipment'
import { initServiceCase, ServiceCase } from './ServiceCase'
import { Alert, initAlert } from './Alert'
import { Import, initImport } from './Import'
import { ImportMapping, initImportMapping } from './ImportMapping'
import { ImportRow, initImportRow } from './ImportRow'
import { initSupplier, Supplier } from './Supplier'

export {
  AuditEvent,
  BomLine,
  Check,
  ComponentLot,
  DefectCode,
  Part,
  Product,
  Revision,
  RouteStep,
  Station,
  Upload,
  User,
  Winding,
}
export { Consumption, Document, Email, Lot, Measurement, Nonconformance, StepRun, Unit }
export { Customer, ServiceCase, Shipment, ShipmentUnit }
export { Alert }
export { Import, ImportMapping, ImportRow }
export { Supplier }

let instance: Sequelize | undefined

function associate(): void {
  AuditEvent.belongsTo(User, { as: 'actor', foreignKey: 'actorId', constraints: false })
  Product.hasMany(Revision, { as: 'revisions', foreignKey: 'productId' })
  Revision.belongsTo(Product, { as: 'product', foreignKey: 'productId' })
  Revision.belongsTo(User, { as: 'releaser', foreignKey: 'releasedBy' })
  Revision.belongsTo(Revision, { as: 'copiedFrom', foreignKey: 'copiedFromId' })
  Revision.hasMany(Winding, { as: 'windings', foreignKey: 'revisionId' })
  Revision.hasMany(RouteStep, { as: 'steps', foreignKey: 'revisionId' })
  Revision.hasMany(BomLine, { as: 'bomLines', foreignKey: 'revisionId' })
  RouteStep.hasMany(Check, { as: 'checks', foreignKey: 'stepId' })
  BomLine.belongsTo(Part, { as: 'part', foreignKey: 'partId' })
  ComponentLot.belongsTo(Part, { as: 'part', foreignKey: 'partId' })
  ComponentLot.belongsTo(Upload, { as: 'certificate', foreignKey: 'certificateUploadId' })
  ComponentLot.belongsTo(Supplier, { as: 'supplier', foreignKey: 'supplierId' })
  Lot.belongsTo(Revision, { as: 'revision', foreignKey: 'revisionId' })
  Unit.belongsTo(Lot, { as: 'lot', foreignKey: 'lotId' })
  Unit.belongsTo(RouteStep, { as: 'currentStep', foreignKey: 'currentStepId' })
  Lot.belongsTo(Customer, { as: 'customer', foreignKey: 'customerId' })
  Shipment.belongsTo(Customer, { as: 'customer', foreignKey: 'customerId' })
  Shipment.hasMany(ShipmentUnit, { as: 'units', foreignKey: 'shipmentId' })
  ServiceCase.belongsTo(Unit, { as: 'unit', foreignKey: 'unitId' })
  ServiceCase.belongsTo(Customer, { as: 'customer', foreignKey: 'customerId' })
  Import.belongsTo(Station, { as: 'station', foreignKey: 'stationId' })
  Import.belongsTo(Upload, { as: 'upload', foreignKey: 'uploadId' })
}

/** The app's Sequelize instance (connected as the app's own, non-owner role), made on first use. */
export function db(): Sequelize {
  if (instance) return instance
  instance = new Sequelize(requireSetting(env.databaseUrl, 'the database URL'), {
    dialect: 'postgres',
    logging: (sql) => logger.trace({ sql }, 'sql'),
    // Bounded waits, so a request fails with a 503 within seconds while the database is away: for
    // a free connection (acquire), and for a new one to be made. A connection that errors is
    // dropped by Sequelize and made again on next use.
    pool: { max: 20, idle: 10_000, acquire: CONNECT_TIMEOUT_MS },
    dialectOptions: { connectionTimeoutMillis: CONNECT_TIMEOUT_MS, keepAlive: true },
    define: { underscored: true },
  })
  for (const init of [
    initUser,
    initStation,
    initAuditEvent,
    initProduct,
    initRevision,
    initWinding,
    initRouteStep,
    initCheck,
    initPart,
    initBomLine,
    initDefectCode,
    initUpload,
    initSupplier,
    initComponentLot,
    initLot,
    initUnit,
    initStepRun,
    initMeasurement,
    initConsumption,
    initNonconformance,
    initDocument,
    initEmail,
    initCustomer,
    initShipment,
    initShipmentUnit,
    initServiceCase,
    initAlert,
    initImport,
    initImportMapping,
    initImportRow,
  ])
    init(instance)
  associate()
  return instance
}

/** Closes the pool; used by shutdown and by tests. */
export async function closeDb(): Promise<void> {
  if (!instance) return
  await instance.close()
  instance = undefined
}
