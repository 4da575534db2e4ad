/** Whether a trial leaves contaminated blocks out of its BE outcome or counts them as 0 % (db enum contaminated_handling). */
export const contaminatedHandlings = ["exclude", "count_as_zero"] as const;
export type ContaminatedHandling = (typeof contaminatedHandlings)[number];
