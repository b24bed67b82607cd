// s3rver ships no types; this covers the part scripts/s3Fake.ts uses.
declare module 's3rver' {
  interface S3rverOptions {
    port?: number
    address?: string
    silent?: boolean
    directory: string
    resetOnClose?: boolean
  }
  export default class S3rver {
    constructor(options: S3rverOptions)
    run(): Promise<{ address: string; port: number }>
    close(): Promise<void>
  }
}
