/**
 * The values of the co-op's lists that the database keeps as enums (db/schema/enums.ts builds
 * them from here) and the forms check against: written once.
 */
export const farmStatuses = ["active", "suspended", "removed"] as const;
export const registryStatuses = ["proposed", "active", "retired"] as const;
export const strainSources = ["culture_bank", "wild_clone", "own_isolate"] as const;
export const substrateTreatments = ["sterilised", "pasteurised"] as const;
export const treatmentKinds = ["fruiting_method", "humidity", "other"] as const;
export const enrolmentStatuses = ["invited", "accepted", "declined", "dropped"] as const;
export const tokenPurposes = ["invitation", "password_reset"] as const;

export type StrainSource = (typeof strainSources)[number];
