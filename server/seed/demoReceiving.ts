import type { DefectCodeInput } from '../../shared/schemas/recipes'

/** A useful starting set of defect codes for converter builds, in our own words. */
export const DEMO_DEFECT_CODES: DefectCodeInput[] = [
  {
    code: 'W-TURNS',
    description: 'Turn count wrong on a winding',
    stationKinds: ['winding'],
    isActive: true,
  },
  {
    code: 'W-WIRE-DMG',
    description: 'Wire enamel scraped or wire nicked',
    stationKinds: ['winding'],
    isActive: true,
  },
  {
    code: 'W-GAUGE',
    description: 'Wire of the wrong diameter used',
    stationKinds: ['winding'],
    isActive: true,
  },
  {
    code: 'W-TAPE',
    description: 'Insulation tape missing or torn between layers',
    stationKinds: ['winding'],
    isActive: true,
  },
  {
    code: 'S-BRIDGE',
    description: 'Solder bridge between pads or pins',
    stationKinds: ['soldering', 'inspection'],
    isActive: true,
  },
  {
    code: 'S-COLD',
    description: 'Dull, cracked or poorly wetted joint',
    stationKinds: ['soldering', 'inspection'],
    isActive: true,
  },
  {
    code: 'S-MISSING',
    description: 'Part not fitted',
    stationKinds: ['soldering', 'inspection'],
    isActive: true,
  },
  {
    code: 'S-POLARITY',
    description: 'Part fitted the wrong way round',
    stationKinds: ['soldering', 'inspection'],
    isActive: true,
  },
  {
    code: 'H-BREAK',
    description: 'Insulation broke down under test voltage',
    stationKinds: ['hipot'],
    isActive: true,
  },
  {
    code: 'H-LEAK',
    description: 'Leakage current above the limit',
    stationKinds: ['hipot'],
    isActive: true,
  },
  {
    code: 'H-ARC',
    description: 'Arcing or flashover seen or heard',
    stationKinds: ['hipot'],
    isActive: true,
  },
  {
    code: 'L-VOUT',
    description: 'Output voltage outside its limits',
    stationKinds: ['load_test'],
    isActive: true,
  },
  {
    code: 'L-RIPPLE',
    description: 'Output ripple too high',
    stationKinds: ['load_test'],
    isActive: true,
  },
  {
    code: 'L-EFF',
    description: 'Efficiency below the limit',
    stationKinds: ['load_test'],
    isActive: true,
  },
  {
    code: 'L-HOT',
    description: 'Runs too hot under load',
    stationKinds: ['load_test'],
    isActive: true,
  },
  {
    code: 'L-NOSTART',
    description: 'Does not start up',
    stationKinds: ['load_test'],
    isActive: true,
  },
  {
    code: 'I-COSMETIC',
    description: 'Scratch, dent or mark on the enclosure',
    stationKinds: ['inspection', 'packing'],
    isActive: true,
  },
  {
    code: 'I-LABEL',
    description: 'Rating label wrong, missing or unreadable',
    stationKinds: ['inspection', 'packing'],
    isActive: true,
  },
]

/**
 * Component lots in stores, received (and expiring) a number of days before the seed's anchor so
 * that stores' history lines up with the six weeks of builds. One tape lot is past its expiry;
 * core lot HM-26-0502 was quarantined by stores on receipt; HM-26-0561 is the suspect core lot a
 * containment holds later in the story. A core lot's `alFactor` is its own AL against the
 * nominal: ungapped ferrite is sold at ±25 %, and each batch sits somewhere in that band.
 */
export const DEMO_COMPONENT_LOTS: {
  partNumber: string
  supplierName: string
  supplierLotCode: string
  quantityReceived: number
  receivedDaysAgo: number
  /** Days after the anchor the lot expires (negative: already expired). */
  expiresInDays?: number
  quarantine?: string
  alFactor?: number
}[] = [
  {
    partNumber: 'FCS-3000U',
    supplierName: 'Harrowgate Magnetics',
    supplierLotCode: 'HM-26-0419',
    quantityReceived: 120,
    receivedDaysAgo: 61,
    alFactor: 1.06,
  },
  {
    partNumber: 'FCS-3000U',
    supplierName: 'Harrowgate Magnetics',
    supplierLotCode: 'HM-26-0502',
    quantityReceived: 120,
    receivedDaysAgo: 47,
    quarantine: 'AL measured 18 % low on a sample of 5: supplier asked for a report',
    alFactor: 0.82,
  },
  {
    partNumber: 'FCS-3000U',
    supplierName: 'Harrowgate Magnetics',
    supplierLotCode: 'HM-26-0547',
    quantityReceived: 120,
    receivedDaysAgo: 33,
    alFactor: 0.95,
  },
  {
    partNumber: 'FCS-2200U',
    supplierName: 'Harrowgate Magnetics',
    supplierLotCode: 'HM-26-0388',
    quantityReceived: 60,
    receivedDaysAgo: 75,
    alFactor: 0.97,
  },
  {
    partNumber: 'FCS-2200U',
    supplierName: 'Harrowgate Magnetics',
    supplierLotCode: 'HM-26-0561',
    quantityReceived: 40,
    receivedDaysAgo: 26,
    alFactor: 0.86,
  },
  {
    partNumber: 'BOB-12P',
    supplierName: 'Tollan Plastics',
    supplierLotCode: 'TP240917',
    quantityReceived: 500,
    receivedDaysAgo: 80,
  },
  {
    partNumber: 'WCU-140',
    supplierName: 'Brindle Wire Co.',
    supplierLotCode: 'BW-7781',
    quantityReceived: 500,
    receivedDaysAgo: 54,
  },
  {
    partNumber: 'WCU-045',
    supplierName: 'Brindle Wire Co.',
    supplierLotCode: 'BW-7790',
    quantityReceived: 3000,
    receivedDaysAgo: 54,
  },
  {
    partNumber: 'TPI-25',
    supplierName: 'Quellmere Tapes',
    supplierLotCode: 'Q-25-1102',
    quantityReceived: 330,
    receivedDaysAgo: 400,
    expiresInDays: -35,
  },
  {
    partNumber: 'TPI-25',
    supplierName: 'Quellmere Tapes',
    supplierLotCode: 'Q-26-0814',
    quantityReceived: 330,
    receivedDaysAgo: 110,
    expiresInDays: 255,
  },
  {
    partNumber: 'PCB-FP24-B',
    supplierName: 'Larkspur Circuits',
    supplierLotCode: 'LC-B-2641',
    quantityReceived: 150,
    receivedDaysAgo: 46,
  },
  {
    partNumber: 'PCB-FP12-A',
    supplierName: 'Larkspur Circuits',
    supplierLotCode: 'LC-A-2633',
    quantityReceived: 50,
    receivedDaysAgo: 100,
  },
  {
    partNumber: 'ICP-PWM2',
    supplierName: 'Northway Components',
    supplierLotCode: 'D/C 2630',
    quantityReceived: 250,
    receivedDaysAgo: 66,
  },
  {
    partNumber: 'MSF-100V',
    supplierName: 'Northway Components',
    supplierLotCode: 'D/C 2622',
    quantityReceived: 500,
    receivedDaysAgo: 66,
  },
  {
    partNumber: 'DUF-600V',
    supplierName: 'Northway Components',
    supplierLotCode: 'D/C 2618',
    quantityReceived: 1000,
    receivedDaysAgo: 66,
  },
  {
    partNumber: 'CEL-450',
    supplierName: 'Northway Components',
    supplierLotCode: 'D/C 2627',
    quantityReceived: 400,
    receivedDaysAgo: 64,
  },
  {
    partNumber: 'SLD-SAC3',
    supplierName: 'Ostley Solder',
    supplierLotCode: 'OS-55120',
    quantityReceived: 2000,
    receivedDaysAgo: 157,
    expiresInDays: 573,
  },
  {
    partNumber: 'ENC-AL2',
    supplierName: 'Penwick Enclosures',
    supplierLotCode: 'PE-1187',
    quantityReceived: 150,
    receivedDaysAgo: 38,
  },
]

/** The core lot of this supplier code's own AL against the nominal. */
export function coreAlFactor(supplierLotCode: string): number {
  const lot = DEMO_COMPONENT_LOTS.find((l) => l.supplierLotCode === supplierLotCode)
  if (lot?.alFactor === undefined) throw new Error(`demo seed: ${supplierLotCode} is no core lot`)
  return lot.alFactor
}
