/** What became of an upload (db enum upload_outcome). */
export const uploadOutcomes = ["received", "rejected", "committed", "already_imported"] as const;
export type UploadOutcome = (typeof uploadOutcomes)[number];
