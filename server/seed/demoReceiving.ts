import type { DefectCodeInput } from '../../shared/schemas/recipes'

/** Codes that apply at the same stations, each with its description. */
const codesAt = (
  stationKinds: DefectCodeInput['stationKinds'],
  codes: [code: string, description: string][],
): DefectCodeInput[] =>
  codes.map(([code, description]) => ({ code, description, stationKinds, isActive: true }))

/** A useful starting set of defect codes for converter builds, in our own words. */
export const DEMO_DEFECT_CODES: DefectCodeInput[] = [
  ...codesAt(
    ['winding'],
    [
      ['W-TURNS', 'Turn count wrong on a winding'],
      ['W-WIRE-DMG', 'Wire enamel scraped or wire nicked'],
      ['W-GAUGE', 'Wire of the wrong diameter used'],
      ['W-TAPE', 'Insulation tape missing or torn between layers'],
    ],
  ),
  ...codesAt(
    ['soldering', 'inspection'],
    [
      ['S-BRIDGE', 'Solder bridge between pads or pins'],
      ['S-COLD', 'Dull, cracked or poorly wetted joint'],
      ['S-MISSING', 'Part not fitted'],
      ['S-POLARITY', 'Part fitted the wrong way round'],
    ],
  ),
  ...codesAt(
    ['hipot'],
    [
      ['H-BREAK', 'Insulation broke down under test voltage'],
      ['H-LEAK', 'Leakage current above the limit'],
      ['H-ARC', 'Arcing or flashover seen or heard'],
    ],
  ),
  ...codesAt(
    ['load_test'],
    [
      ['L-VOUT', 'Output voltage outside its limits'],
      ['L-RIPPLE', 'Output ripple too high'],
      ['L-EFF', 'Efficiency below the limit'],
      ['L-HOT', 'Runs too hot under load'],
      ['L-NOSTART', 'Does not start up'],
    ],
  ),
  ...codesAt(
    ['inspection', 'packing'],
    [
      ['I-COSMETIC', 'Scratch, dent or mark on the enclosure'],
      ['I-LABEL', 'Rating label wrong, missing or unreadable'],
    ],
  ),
]

export interface DemoComponentLot {
  partNumber: string
  supplierName: string
  supplierLotCode: string
  quantityReceived: number
  receivedDaysAgo: number
  /** Days after the anchor the lot expires (negative: already expired). */
  expiresInDays?: number
  quarantine?: string
  alFactor?: number
}

type Extra = Pick<DemoComponentLot, 'expiresInDays' | 'quarantine' | 'alFactor'>

/** One supplier's lots: part, the supplier's lot code, quantity, days since received, extras. */
const lotsFrom = (
  supplierName: string,
  lots: [partNumber: string, lotCode: string, quantity: number, daysAgo: number, extra?: Extra][],
): DemoComponentLot[] =>
  lots.map(([partNumber, supplierLotCode, quantityReceived, receivedDaysAgo, extra]) => ({
    partNumber,
    supplierName,
    supplierLotCode,
    quantityReceived,
    receivedDaysAgo,
    ...extra,
  }))

/**
 * Component lots in stores, received (and expiring) a number of days before the seed's anchor so
 * that stores' history lines up with the six weeks of builds. One tape lot is past its expiry;
 * core lot HM-26-0502 was quarantined by stores on receipt; HM-26-0561 is the suspect core lot a
 * containment holds later in the story. A core lot's `alFactor` is its own AL against the
 * nominal: ungapped ferrite is sold at ±25 %, and each batch sits somewhere in that band.
 */
export const DEMO_COMPONENT_LOTS: DemoComponentLot[] = [
  ...lotsFrom('Harrowgate Magnetics', [
    ['FCS-3000U', 'HM-26-0419', 120, 61, { alFactor: 1.06 }],
    [
      'FCS-3000U',
      'HM-26-0502',
      120,
      47,
      {
        quarantine: 'AL measured 18 % low on a sample of 5: supplier asked for a report',
        alFactor: 0.82,
      },
    ],
    ['FCS-3000U', 'HM-26-0547', 120, 33, { alFactor: 0.95 }],
    ['FCS-2200U', 'HM-26-0388', 60, 75, { alFactor: 0.97 }],
    ['FCS-2200U', 'HM-26-0561', 40, 26, { alFactor: 0.86 }],
  ]),
  ...lotsFrom('Tollan Plastics', [['BOB-12P', 'TP240917', 500, 80]]),
  ...lotsFrom('Brindle Wire Co.', [
    ['WCU-140', 'BW-7781', 500, 54],
    ['WCU-045', 'BW-7790', 3000, 54],
  ]),
  ...lotsFrom('Quellmere Tapes', [
    ['TPI-25', 'Q-25-1102', 330, 400, { expiresInDays: -35 }],
    ['TPI-25', 'Q-26-0814', 330, 110, { expiresInDays: 255 }],
  ]),
  ...lotsFrom('Larkspur Circuits', [
    ['PCB-FP24-B', 'LC-B-2641', 150, 46],
    ['PCB-FP12-A', 'LC-A-2633', 50, 100],
  ]),
  ...lotsFrom('Northway Components', [
    ['ICP-PWM2', 'D/C 2630', 250, 66],
    ['MSF-100V', 'D/C 2622', 500, 66],
    ['DUF-600V', 'D/C 2618', 1000, 66],
    ['CEL-450', 'D/C 2627', 400, 64],
  ]),
  ...lotsFrom('Ostley Solder', [['SLD-SAC3', 'OS-55120', 2000, 157, { expiresInDays: 573 }]]),
  ...lotsFrom('Penwick Enclosures', [['ENC-AL2', 'PE-1187', 150, 38]]),
]

/** The core lot of this supplier code's own AL against the nominal. */
export function coreAlFactor(supplierLotCode: string): number {
  const lot = DEMO_COMPONENT_LOTS.find((l) => l.supplierLotCode === supplierLotCode)
  if (lot?.alFactor === undefined) throw new Error(`demo seed: ${supplierLotCode} is no core lot`)
  return lot.alFactor
}
