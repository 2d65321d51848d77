import { resolve } from 'node:path'
import fsDriver from 'unstorage/drivers/fs'
import s3Driver from 'unstorage/drivers/s3'

/**
 * Mounts the `uploads` storage (lab-sheet photos) from runtime config, so one build can keep
 * photos on disk in development and in an S3-compatible bucket in production.
 */
export default defineNitroPlugin(() => {
  const { uploads } = useRuntimeConfig()
  if (uploads.driver === 's3') {
    useStorage().mount('uploads', s3Driver({
      bucket: uploads.s3.bucket,
      endpoint: uploads.s3.endpoint,
      region: uploads.s3.region,
      accessKeyId: uploads.s3.accessKeyId,
      secretAccessKey: uploads.s3.secretAccessKey,
    }))
    return
  }
  useStorage().mount('uploads', fsDriver({ base: resolve(uploads.dir || '.data/uploads') }))
})
