"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { guardedAction } from "@/lib/auth/guard";
import { memberRoles } from "@/lib/auth/permissions";
import {
  admitFarm,
  cancelInvitation,
  changeRole,
  deactivatePerson,
  inviteMember,
  resendInvitation,
  setFarmStatus,
} from "@/lib/data/members";
import { farmStatuses } from "@/lib/members/lists";

const email = z.string().trim().toLowerCase().pipe(z.email("Enter an e-mail address such as name@farm.example."));

const admitFarmSchema = z.object({
  name: z.string().trim().min(2, "Give the farm's name (at least 2 characters).").max(120, "Keep the farm's name under 120 characters."),
  region: z.string().trim().max(120, "Keep the region under 120 characters.").default(""),
  contactEmail: z.union([z.literal(""), email]).default(""),
});

export const admitFarmAction = guardedAction("members:manage", admitFarmSchema, async (input, member) => {
  await admitFarm(member, input);
  revalidatePath("/members");
  return { status: "ok", message: `${input.name} is now a member farm. Invite its manager below.` };
});

const inviteSchema = z.object({
  email,
  role: z.enum(memberRoles, "Choose a role."),
  farmId: z.union([z.literal(""), z.uuid("Choose a member farm.")]).transform((value) => value || null),
});

export const inviteMemberAction = guardedAction("members:manage", inviteSchema, async (input, member) => {
  await inviteMember(member, input);
  revalidatePath("/members");
  return { status: "ok", message: `Invitation sent to ${input.email}. The link works for 7 days.` };
});

const invitationSchema = z.object({ invitationId: z.uuid("Choose an open invitation.") });

export const resendInvitationAction = guardedAction("members:manage", invitationSchema, async (input, member) => {
  await resendInvitation(member, input.invitationId);
  revalidatePath("/members");
  return { status: "ok", message: "Sent again with a new link, good for 7 days; the earlier link no longer works." };
});

export const cancelInvitationAction = guardedAction("members:manage", invitationSchema, async (input, member) => {
  await cancelInvitation(member, input.invitationId);
  revalidatePath("/members");
  return { status: "ok", message: "Invitation cancelled: its link no longer works." };
});

const farmStatusSchema = z.object({ farmId: z.uuid(), status: z.enum(farmStatuses) });

export const setFarmStatusAction = guardedAction("members:manage", farmStatusSchema, async (input, member) => {
  await setFarmStatus(member, input.farmId, input.status);
  revalidatePath("/members");
  return {
    status: "ok",
    message:
      input.status === "active"
        ? "Farm reinstated."
        : input.status === "suspended"
          ? "Farm suspended: its people cannot sign in until you reinstate it."
          : "Farm removed: its people cannot sign in.",
  };
});

const roleSchema = z.object({ userId: z.uuid(), role: z.enum(memberRoles, "Choose a role.") });

export const changeRoleAction = guardedAction("members:manage", roleSchema, async (input, member) => {
  await changeRole(member, input.userId, input.role);
  revalidatePath("/members");
  return { status: "ok", message: "Role changed; they have been told by e-mail." };
});

const personSchema = z.object({ userId: z.uuid() });

export const deactivatePersonAction = guardedAction("members:manage", personSchema, async (input, member) => {
  await deactivatePerson(member, input.userId);
  revalidatePath("/members");
  return { status: "ok", message: "Deactivated: they can no longer sign in." };
});
