import { describe, expect, it } from 'vitest'
import { sha256 } from '../../../server/storage'

describe('sha256', () => {
  it('matches the published digest of "abc"', () => {
    // FIPS 180-2, Appendix B.1 (SHA-256 example, one-block message "abc").
    expect(sha256(Buffer.from('abc'))).toBe(
      'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad',
    )
  })
})
