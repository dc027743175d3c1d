/** Storage (KV or the ledger) failed to answer: the request may succeed later, and nothing is assumed stored. */
export class StorageUnavailableError extends Error {
  constructor(what: string, cause?: unknown) {
    super(`Storage is unavailable: ${what}.`, cause === undefined ? undefined : { cause });
    this.name = "StorageUnavailableError";
  }
}
