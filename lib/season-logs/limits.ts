import { largestUploadBytes } from "./report";

/**
 * How much season-log work one farm, and one app process, may have going at once. A farm sends
 * a handful of files a season, most well under a megabyte; these limits only stop one farm (or
 * a script with its password) from filling the disk or the server's memory for everyone.
 */
export const uploadLimits = {
  /** Files one farm may be sending or re-reading at the same time, across every app process. */
  concurrentPerFarm: 2,
  /** Bytes of season-log files one farm may keep (files of rejected uploads count until removed). */
  storedBytesPerFarm: 500 * 1024 * 1024,
  /** A reservation left by a process that died mid-upload lapses after this long. */
  reservationMinutes: 30,
  /**
   * Bytes of uploads one process reads and parses at once; a file that would pass it waits its
   * turn. One file of the largest size at a time: reading one, every row wrong, costs about
   * 700 MB (tests/e2e/upload-memory.test.ts keeps three sent at once under 1 GB).
   */
  processingBytesPerProcess: largestUploadBytes,
  /** After reading a file this large, the process collects its garbage before the next file starts. */
  collectGarbageAfterBytes: 10 * 1024 * 1024,
} as const;

const megabytes = (bytes: number) => `${Math.round(bytes / (1024 * 1024))} MB`;

export function tooManyUploadsMessage(limit: number): string {
  return `Your farm is already sending ${limit} season logs. Wait until one of them has finished, then send this file again.`;
}

export function storageFullMessage(usedBytes: number, addingBytes: number, limitBytes: number, retentionDays: number): string {
  return (
    `Your farm keeps ${megabytes(usedBytes)} of season-log files, and this one (${megabytes(addingBytes)}) would pass the co-op's ` +
    `limit of ${megabytes(limitBytes)} per farm. Files of rejected uploads are removed ${retentionDays} days after they were sent; ` +
    "if you need room sooner, ask the coordinator."
  );
}
