import { pgEnum } from "drizzle-orm/pg-core";
import { memberRoles } from "../../lib/auth/permissions";
import { dateStyleNames } from "../../lib/time/display";
import { trialDesignKinds } from "../../lib/trials/design-kind";
import { trialStatuses } from "../../lib/trials/lifecycle";
import { contaminatedHandlings } from "../../lib/trials/contaminated-handling";
import {
  enrolmentStatuses,
  farmStatuses,
  registryStatuses,
  strainSources,
  substrateTreatments,
  tokenPurposes,
  treatmentKinds,
} from "../../lib/members/lists";
import { uploadOutcomes } from "../../lib/season-logs/outcomes";
import { displayUnitNames } from "../../lib/units/mass";
import { mailOutcomes } from "../../lib/mail/outcomes";
import { humidityModes, roomFreshAirs, roomKinds } from "../../lib/rooms/lists";

export const memberRole = pgEnum("member_role", memberRoles);
export const farmStatus = pgEnum("farm_status", farmStatuses);
export const registryStatus = pgEnum("registry_status", registryStatuses);
export const strainSource = pgEnum("strain_source", strainSources);
export const substrateTreatment = pgEnum("substrate_treatment", substrateTreatments);
export const treatmentKind = pgEnum("treatment_kind", treatmentKinds);
export const trialStatus = pgEnum("trial_status", trialStatuses);
export const trialDesignKind = pgEnum("trial_design_kind", trialDesignKinds);
export const contaminatedHandling = pgEnum("contaminated_handling", contaminatedHandlings);
export const enrolmentStatus = pgEnum("enrolment_status", enrolmentStatuses);
export const uploadOutcome = pgEnum("upload_outcome", uploadOutcomes);
export const displayUnits = pgEnum("display_units", displayUnitNames);
export const dateStyle = pgEnum("date_style", dateStyleNames);
export const tokenPurpose = pgEnum("token_purpose", tokenPurposes);
export const mailOutcome = pgEnum("mail_outcome", mailOutcomes);
export const roomKind = pgEnum("room_kind", roomKinds);
export const roomFreshAir = pgEnum("room_fresh_air", roomFreshAirs);
export const humidityMode = pgEnum("humidity_mode", humidityModes);
