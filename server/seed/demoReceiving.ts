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

/** Component lots in stores; one tape lot is past its expiry and one core lot is quarantined. */
export const DEMO_COMPONENT_LOTS: {
  partNumber: string
  supplierName: string
  supplierLotCode: string
  quantityReceived: number
  receivedOn: string
  expiresOn?: string
  quarantine?: string
}[] = [
  {
    partNumber: 'FCS-3000U',
    supplierName: 'Harrowgate Magnetics',
    supplierLotCode: 'HM-26-0419',
    quantityReceived: 120,
    receivedOn: '2026-10-05',
  },
  {
    partNumber: 'FCS-3000U',
    supplierName: 'Harrowgate Magnetics',
    supplierLotCode: 'HM-26-0502',
    quantityReceived: 120,
    receivedOn: '2026-11-09',
    quarantine: 'AL measured 18 % low on a sample of 5: supplier asked for a report',
  },
  {
    partNumber: 'FCS-2200U',
    supplierName: 'Harrowgate Magnetics',
    supplierLotCode: 'HM-26-0388',
    quantityReceived: 60,
    receivedOn: '2026-09-21',
  },
  {
    partNumber: 'BOB-12P',
    supplierName: 'Tollan Plastics',
    supplierLotCode: 'TP240917',
    quantityReceived: 500,
    receivedOn: '2026-09-17',
  },
  {
    partNumber: 'WCU-140',
    supplierName: 'Brindle Wire Co.',
    supplierLotCode: 'BW-7781',
    quantityReceived: 500,
    receivedOn: '2026-10-12',
  },
  {
    partNumber: 'WCU-045',
    supplierName: 'Brindle Wire Co.',
    supplierLotCode: 'BW-7790',
    quantityReceived: 3000,
    receivedOn: '2026-10-12',
  },
  {
    partNumber: 'TPI-25',
    supplierName: 'Quellmere Tapes',
    supplierLotCode: 'Q-25-1102',
    quantityReceived: 330,
    receivedOn: '2025-11-02',
    expiresOn: '2026-11-02',
  },
  {
    partNumber: 'TPI-25',
    supplierName: 'Quellmere Tapes',
    supplierLotCode: 'Q-26-0814',
    quantityReceived: 330,
    receivedOn: '2026-08-14',
    expiresOn: '2027-08-14',
  },
  {
    partNumber: 'PCB-FP24-B',
    supplierName: 'Larkspur Circuits',
    supplierLotCode: 'LC-B-2641',
    quantityReceived: 100,
    receivedOn: '2026-10-20',
  },
  {
    partNumber: 'PCB-FP12-A',
    supplierName: 'Larkspur Circuits',
    supplierLotCode: 'LC-A-2633',
    quantityReceived: 50,
    receivedOn: '2026-08-25',
  },
  {
    partNumber: 'ICP-PWM2',
    supplierName: 'Northway Components',
    supplierLotCode: 'D/C 2630',
    quantityReceived: 250,
    receivedOn: '2026-09-30',
  },
  {
    partNumber: 'MSF-100V',
    supplierName: 'Northway Components',
    supplierLotCode: 'D/C 2622',
    quantityReceived: 500,
    receivedOn: '2026-09-30',
  },
  {
    partNumber: 'DUF-600V',
    supplierName: 'Northway Components',
    supplierLotCode: 'D/C 2618',
    quantityReceived: 1000,
    receivedOn: '2026-09-30',
  },
  {
    partNumber: 'CEL-450',
    supplierName: 'Northway Components',
    supplierLotCode: 'D/C 2627',
    quantityReceived: 400,
    receivedOn: '2026-10-02',
  },
  {
    partNumber: 'SLD-SAC3',
    supplierName: 'Ostley Solder',
    supplierLotCode: 'OS-55120',
    quantityReceived: 2000,
    receivedOn: '2026-07-01',
    expiresOn: '2028-07-01',
  },
  {
    partNumber: 'ENC-AL2',
    supplierName: 'Penwick Enclosures',
    supplierLotCode: 'PE-1187',
    quantityReceived: 150,
    receivedOn: '2026-10-28',
  },
]
