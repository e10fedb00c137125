// The local S3 fake ships no types: what the development and test set-up use of it.
declare module 's3rver' {
  export default class S3rver {
    constructor(options: {
      port?: number
      address?: string
      directory: string
      silent?: boolean
      configureBuckets?: { name: string }[]
    })
    run(): Promise<{ address: string; port: number }>
    close(): Promise<void>
  }
}
