// The way into server/storage: the content store chosen by configuration and the registry that decides when
// stored bytes may be removed.
import { getConfig } from '../config';
import type { ContentStore } from './contentStore';
import { LocalContentStore } from './localContentStore';
import { S3ContentStore } from './s3ContentStore';

export type { ContentStore } from './contentStore';
export { LocalContentStore } from './localContentStore';
export { S3ContentStore } from './s3ContentStore';
export {
  markUnreferenced,
  referenceContent,
  removeUnreferencedContent,
  startContentSweeper,
  sweepOrphans,
  sweepStrays,
} from './contentRegistry';

let current: { key: string; store: ContentStore } | undefined;
let override: ContentStore | undefined;

/** The store the configuration names (STORAGE=local with UPLOAD_DIR, or STORAGE=s3 with S3_*), one per setting. */
export function getContentStore(): ContentStore {
  if (override) return override;
  const config = getConfig();
  const key = JSON.stringify([config.storage, config.uploadDir]);
  if (current?.key !== key) {
    const { storage } = config;
    const store: ContentStore =
      storage.kind === 's3'
        ? new S3ContentStore({
            bucket: storage.bucket,
            prefix: storage.prefix,
            region: storage.region,
            endpoint: storage.endpoint,
            forcePathStyle: storage.forcePathStyle,
            credentials: storage.credentials,
          })
        : new LocalContentStore(config.uploadDir);
    current = { key, store };
  }
  return current.store;
}

/**
 * Makes every caller use `store` until the returned function is called (the shared storage tests run the same
 * API flows against each back end). @returns the function that restores the configured store.
 */
export function useContentStore(store: ContentStore): () => void {
  override = store;
  return () => {
    if (override === store) override = undefined;
  };
}
