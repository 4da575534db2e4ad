import { pgEnum } from "drizzle-orm/pg-core";
import { memberRoles } from "../../lib/auth/permissions";
import { dateStyleNames } from "../../lib/time/display";
import { trialStatuses } from "../../lib/trials/lifecycle";

export const memberRole = pgEnum("member_role", memberRoles);
export const farmStatus = pgEnum("farm_status", ["active", "suspended", "removed"]);
export const registryStatus = pgEnum("registry_status", ["proposed", "active", "retired"]);
export const strainSource = pgEnum("strain_source", ["culture_bank", "wild_clone", "own_isolate"]);
export const substrateTreatment = pgEnum("substrate_treatment", ["sterilised", "pasteurised"]);
export const treatmentKind = pgEnum("treatment_kind", ["fruiting_method", "humidity", "other"]);
export const trialStatus = pgEnum("trial_status", trialStatuses);
export const contaminatedHandling = pgEnum("contaminated_handling", ["exclude", "count_as_zero"]);
export const enrolmentStatus = pgEnum("enrolment_status", ["invited", "accepted", "declined", "dropped"]);
export const uploadOutcome = pgEnum("upload_outcome", ["received", "rejected", "committed", "already_imported"]);
export const displayUnits = pgEnum("display_units", ["metric", "imperial"]);
export const dateStyle = pgEnum("date_style", dateStyleNames);
export const tokenPurpose = pgEnum("token_purpose", ["invitation", "password_reset"]);
export const mailOutcome = pgEnum("mail_outcome", ["queued", "sent", "retrying", "failed", "cancelled"]);
