import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { cellBoolean, cellNumber, columnFit, proposeMapping } from '../../../shared/imports'
import { parseBenchCsv } from '../../../server/services/imports/benchCsv'

// The typed checks of the demo FP24 load-test step (server/seed/demoRecipes.ts).
const LOAD_TEST_CHECKS = [
  { key: 'vin', label: 'Input voltage', unit: 'V' as const },
  { key: 'iin', label: 'Input current', unit: 'A' as const },
  { key: 'vout', label: 'Output voltage, full load', unit: 'V' as const },
  { key: 'iout', label: 'Output current', unit: 'A' as const },
  { key: 'vout_no_load', label: 'Output voltage, no load', unit: 'V' as const },
  { key: 'ripple_pp', label: 'Output ripple, peak to peak', unit: 'V' as const },
  { key: 'case_temp', label: 'Case temperature after 10 min', unit: '°C' as const },
]

describe('bench file column mapping', () => {
  it('proposes the serial, time, operator and every check column of the sample rack file', () => {
    const text = readFileSync(
      new URL('../../fixtures/bench-ldt1-sample.csv', import.meta.url),
      'utf8',
    )
    const table = parseBenchCsv(text)
    expect(table.rows).toHaveLength(7)
    // Expected mapping read off the sample file's header by hand (common practice, no source).
    expect(proposeMapping(table.columns, LOAD_TEST_CHECKS)).toEqual({
      serialColumn: 'Serial No',
      timeColumn: 'Test start',
      operatorColumn: 'Operator',
      checkColumns: {
        vin: 'Vin (V)',
        iin: 'Iin (A)',
        vout: 'Vout (V)',
        iout: 'Iout (A)',
        vout_no_load: 'Vout no load (V)',
        ripple_pp: 'Ripple pp (V)',
        case_temp: 'Case temp (°C)',
      },
    })
  })

  it('ranks a key match over a label match over a partial one, and leaves unmatched checks out', () => {
    const check = { key: 'vout', label: 'Output', unit: 'V' as const }
    expect(columnFit('VOUT', check)).toBe(3)
    expect(columnFit('output', check)).toBe(2)
    expect(columnFit('Vout [V]', check)).toBe(2)
    expect(columnFit('vout_avg_mv', check)).toBe(1)
    expect(columnFit('slot', check)).toBe(0)
    expect(proposeMapping(['SN', 'slot'], [check]).checkColumns).toEqual({})
    expect(proposeMapping(['SN', 'slot'], [check]).serialColumn).toBe('SN')
  })

  it('reads numbers with a decimal point only, and yes/no words', () => {
    expect(cellNumber(' 350.2 ')).toBe(350.2)
    expect(cellNumber('3.5e2')).toBe(350)
    expect(cellNumber('-0.5')).toBe(-0.5)
    for (const bad of ['OL', '', '350 V', '350,2', '1.2.3', 'NaN', 'Infinity', '0x10'])
      expect(cellNumber(bad)).toBeNull()
    expect(cellBoolean('PASS')).toBe(true)
    expect(cellBoolean('no')).toBe(false)
    expect(cellBoolean('maybe')).toBeNull()
  })

  it('reads semicolon and tab files, a byte-order mark and quoted cells', () => {
    const semi = parseBenchCsv('\uFEFFSerial;Vout (V)\r\nA1;"350,2"\r\n')
    expect(semi).toEqual({ columns: ['Serial', 'Vout (V)'], rows: [['A1', '350,2']] })
    expect(parseBenchCsv('Serial\tVout\nA1\t350\n').rows).toEqual([['A1', '350']])
    expect(() => parseBenchCsv('Serial,Serial\nA,B\n')).toThrow(/two columns are named "Serial"/)
    expect(() => parseBenchCsv('Serial,Vout\n')).toThrow(/no rows/)
  })
})
