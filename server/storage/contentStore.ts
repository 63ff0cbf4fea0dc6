import type { StoredContent } from '../uploads';

/**
 * Where uploaded files and design sheets keep their bytes: a content-addressed store (the SHA-256 of the bytes is
 * their only name). Two back ends implement it — a local folder (the default) and an S3-compatible bucket — and
 * every caller goes through this interface, so both behave the same: the same addresses, the same refusal of a
 * malformed address before anything is touched, the same re-hashing on read, the same errors
 * (ContentStoreError 'invalid_hash' | 'not_found' | 'corrupt').
 *
 * The store knows nothing about who refers to which bytes; server/storage/contentRegistry.ts decides when bytes may
 * go, safely across processes and database nodes.
 */
export interface ContentStore {
  /** 'local' or 's3' (shown by the health check and the scale test). */
  readonly kind: 'local' | 's3';
  /**
   * Stores bytes under their SHA-256. Atomic (a reader never sees part of an object) and idempotent (the same
   * bytes again are harmless). @returns the address, relative key and size.
   */
  put(bytes: Uint8Array): Promise<StoredContent>;
  /**
   * Reads stored bytes back; `verify` re-hashes them and refuses content that no longer matches its name.
   * @throws ContentStoreError 'invalid_hash' | 'not_found' | 'corrupt'
   */
  get(sha256: string, options?: { verify?: boolean }): Promise<Buffer>;
  /** Whether bytes are stored under `sha256`. @throws ContentStoreError 'invalid_hash' */
  has(sha256: string): Promise<boolean>;
  /** Removes bytes (whether anything still refers to them is the caller's business). @returns whether they existed. */
  remove(sha256: string): Promise<boolean>;
  /**
   * One page of what the store holds, in hash order, for the sweep that finds bytes nothing registered (a process
   * that died between putting them and committing): each hash with when it was stored.
   * @param options.after - where to go on: the previous page's `next` (a position the store chose, not to be parsed)
   * @param options.limit - most items on the page
   * @returns the page and where the next page starts, or null at the end
   */
  list(options: { after?: string; limit: number }): Promise<{ items: StoredItem[]; next: string | null }>;
  /**
   * Removes what writes interrupted by a crash left behind, older than `olderThan` (the local folder's temporary
   * files; an S3 PUT leaves nothing). @returns how many were removed
   */
  removeLeftovers?(olderThan: Date): Promise<number>;
}

/** A stored content and when its bytes were last written. */
export interface StoredItem {
  sha256: string;
  storedAt: Date;
}
