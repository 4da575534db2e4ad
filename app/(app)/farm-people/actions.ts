"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { guardedAction } from "@/lib/auth/guard";
import { cancelInvitation, deactivatePerson, inviteMember, resendInvitation, transferManagerRole } from "@/lib/data/members";

const inviteGrowerSchema = z.object({
  email: z.string().trim().toLowerCase().pipe(z.email("Enter an e-mail address such as name@farm.example.")),
});

export const inviteGrowerAction = guardedAction("farm-staff:manage", inviteGrowerSchema, async (input, member) => {
  await inviteMember(member, { email: input.email, role: "grower", farmId: member.farmId });
  revalidatePath("/farm-people");
  return { status: "ok", message: `Invitation sent to ${input.email}. The link works once, for 7 days.` };
});

const invitationSchema = z.object({ invitationId: z.uuid("Choose an open invitation.") });

export const resendGrowerInvitationAction = guardedAction("farm-staff:manage", invitationSchema, async (input, member) => {
  await resendInvitation(member, input.invitationId);
  revalidatePath("/farm-people");
  return { status: "ok", message: "Sent again with a new link, good for 7 days; the earlier link no longer works." };
});

export const cancelGrowerInvitationAction = guardedAction("farm-staff:manage", invitationSchema, async (input, member) => {
  await cancelInvitation(member, input.invitationId);
  revalidatePath("/farm-people");
  return { status: "ok", message: "Invitation cancelled: its link no longer works." };
});

const personSchema = z.object({ userId: z.uuid("Choose a person of your farm.") });

export const removeGrowerAction = guardedAction("farm-staff:manage", personSchema, async (input, member) => {
  await deactivatePerson(member, input.userId);
  revalidatePath("/farm-people");
  return { status: "ok", message: "Removed: they can no longer sign in. Their past records stay with the farm." };
});

export const transferManagerAction = guardedAction("farm-staff:manage", personSchema, async (input, member) => {
  await transferManagerRole(member, input.userId);
  revalidatePath("/");
  return {
    status: "ok",
    message: "Done: they are now the farm manager and you are a grower. Your menu changes on the next page you open.",
  };
});
