// The app's one file storage, chosen from the configuration (S3 when set, else the data folder).
import { config } from './config';
import { createStorage, type ObjectStorage } from './storage';

let instance: ObjectStorage | null = null;

export function getStorage(): ObjectStorage {
  instance ??= createStorage({
    dataDir: config.dataDir,
    s3Endpoint: config.s3.endpoint,
    s3Bucket: config.s3.bucket,
    s3Region: config.s3.region,
    s3AccessKeyId: config.s3.accessKeyId,
    s3SecretAccessKey: config.s3.secretAccessKey,
  });
  return instance;
}
