import type { Metadata } from "next";
import { Card } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { roleLabels } from "@/lib/auth/permissions";
import { listMembership } from "@/lib/data/members";
import { invitableRoles } from "@/lib/members/roles";
import {
  admitFarmAction,
  cancelInvitationAction,
  changeRoleAction,
  deactivatePersonAction,
  inviteMemberAction,
  resendInvitationAction,
  setFarmStatusAction,
} from "./actions";
import { ActionForm } from "@/components/forms/action-form";
import { OpenInvitations } from "./_components/open-invitations";
import { formatDay } from "@/lib/time/display";
import { timeDisplayFor } from "@/lib/time/member-display";
import { ScrollFrame } from "@/components/ui/scroll-frame";

export const metadata: Metadata = { title: "Members" };

const farmStatusLabels = { active: "Active", suspended: "Suspended", removed: "Removed" } as const;

export default async function MembersPage() {
  const member = await requirePage("members:manage");
  const display = await timeDisplayFor(member);
  const date = (value: Date) => formatDay(value, display);
  const { farms, people, invitations } = await listMembership(member);
  const farmName = new Map(farms.map((farm) => [farm.id, farm.name]));
  const activeFarms = farms.filter((farm) => farm.status === "active");
  // The farm admitted last, chosen in the invitation form while nobody is in it or invited to it yet.
  const newestFarm = [...activeFarms].sort((a, b) => b.joinedAt.getTime() - a.joinedAt.getTime())[0];
  const waitingForManager =
    newestFarm &&
    !people.some((person) => person.farmId === newestFarm.id) &&
    !invitations.some((invitation) => invitation.farmId === newestFarm.id)
      ? newestFarm
      : undefined;

  return (
    <>
      <PageHeader title="Members" lead="Member farms, the people who use Rhizomorph, and the invitations still open." />
      <div className="grid grid-cols-1 gap-6 lg:grid-cols-2">
        <Card title="Admit a farm">
          <ActionForm
            action={admitFarmAction}
            testId="admit-farm"
            submitLabel="Admit farm"
            fields={[
              { name: "name", label: "Farm name" },
              { name: "region", label: "Region" },
              { name: "contactEmail", label: "Contact e-mail", type: "email", hint: "Where the co-op writes to the farm; optional." },
            ]}
          />
        </Card>
        <Card title="Invite someone">
          <p className="mb-3 text-sm text-ink-soft">
            They get an e-mail with a link that works once, for 7 days, to choose their password.
          </p>
          <ActionForm
            // Admitting a farm remounts the form with that farm chosen; sending an invitation does not (its answer stays).
            key={newestFarm?.id ?? "none"}
            action={inviteMemberAction}
            testId="invite-member"
            submitLabel="Send invitation"
            pendingLabel="Sending…"
            fields={[
              { name: "email", label: "Their e-mail", type: "email" },
              {
                name: "role",
                label: "Role",
                options: invitableRoles("coordinator").map((role) => ({ value: role, label: roleLabels[role] })),
                defaultValue: "farm_manager",
              },
              {
                name: "farmId",
                label: "Farm (for a farm manager)",
                defaultValue: waitingForManager?.id ?? "",
                options: [
                  { value: "", label: "No farm (co-op role)" },
                  ...activeFarms.map((farm) => ({ value: farm.id, label: farm.name })),
                ],
              },
            ]}
          />
        </Card>
      </div>

      <h2 className="mt-10 mb-3 text-xl font-semibold text-moss-800">Farms</h2>
      {farms.length === 0 ? (
        <p className="text-ink-soft">No member farms yet: admit the first one above.</p>
      ) : (
        <ul className="space-y-3" aria-label="Member farms">
          {farms.map((farm) => (
            <li key={farm.id} className="flex flex-wrap items-center justify-between gap-3 rounded-lg border border-oat-300 bg-white p-4">
              <div>
                <p className="font-semibold">{farm.name}</p>
                <p className="text-sm text-ink-soft">
                  {farm.region || "No region"} · {farm.contactEmail ?? "no contact e-mail"} · joined {date(farm.joinedAt)} ·{" "}
                  {farmStatusLabels[farm.status]}
                </p>
              </div>
              <div className="flex flex-wrap gap-2">
                {farm.status !== "active" ? (
                  <ActionForm
                    action={setFarmStatusAction}
                    inline
                    hidden={{ farmId: farm.id, status: "active" }}
                    submitLabel="Reinstate"
                    variant="secondary"
                  />
                ) : (
                  <ActionForm
                    action={setFarmStatusAction}
                    inline
                    hidden={{ farmId: farm.id, status: "suspended" }}
                    submitLabel="Suspend"
                    variant="secondary"
                  />
                )}
                {farm.status !== "removed" ? (
                  <ActionForm
                    action={setFarmStatusAction}
                    inline
                    hidden={{ farmId: farm.id, status: "removed" }}
                    submitLabel="Remove"
                    variant="danger"
                    confirm={`Remove ${farm.name}? Its people can no longer sign in. Its rows stay until the farm withdraws them.`}
                  />
                ) : null}
              </div>
            </li>
          ))}
        </ul>
      )}

      <h2 className="mt-10 mb-3 text-xl font-semibold text-moss-800">People</h2>
      <ScrollFrame label="People" className="rounded-lg border border-oat-300 bg-white">
        <table className="min-w-full text-sm">
          <caption className="sr-only">Everyone who can use Rhizomorph, with their role</caption>
          <thead className="bg-oat-200 text-left">
            <tr>
              <th scope="col" className="px-3 py-2">
                Name
              </th>
              <th scope="col" className="px-3 py-2">
                E-mail
              </th>
              <th scope="col" className="px-3 py-2">
                Farm
              </th>
              <th scope="col" className="px-3 py-2">
                Role
              </th>
              <th scope="col" className="px-3 py-2">
                Last signed in
              </th>
              <th scope="col" className="px-3 py-2">
                Access
              </th>
            </tr>
          </thead>
          <tbody>
            {people.map((person) => {
              const farmRole = person.role === "farm_manager" || person.role === "grower";
              const choices = (farmRole ? (["farm_manager", "grower"] as const) : (["coordinator", "observer"] as const)).map((role) => ({
                value: role,
                label: roleLabels[role],
              }));
              return (
                <tr key={person.id} className="border-t border-oat-200 align-top">
                  <td className="px-3 py-2 font-medium">{person.name}</td>
                  <td className="px-3 py-2">{person.email}</td>
                  <td className="px-3 py-2">{person.farmId ? farmName.get(person.farmId) : "Co-op"}</td>
                  <td className="px-3 py-2">
                    {person.active && person.id !== member.id ? (
                      <ActionForm
                        action={changeRoleAction}
                        inline
                        testId={`role-${person.id}`}
                        hidden={{ userId: person.id }}
                        fields={[{ name: "role", label: `Role of ${person.name}`, options: choices, defaultValue: person.role }]}
                        submitLabel="Change role"
                        variant="secondary"
                      />
                    ) : (
                      roleLabels[person.role]
                    )}
                  </td>
                  <td className="px-3 py-2">{person.lastSignInAt ? date(person.lastSignInAt) : "Never"}</td>
                  <td className="px-3 py-2">
                    {!person.active ? (
                      "Deactivated"
                    ) : person.id === member.id ? (
                      "You"
                    ) : (
                      <ActionForm
                        action={deactivatePersonAction}
                        inline
                        hidden={{ userId: person.id }}
                        submitLabel="Deactivate"
                        variant="danger"
                        confirm={`Deactivate ${person.name}? They can no longer sign in.`}
                      />
                    )}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </ScrollFrame>

      <OpenInvitations
        display={display}
        invitations={invitations.map((invitation) => ({
          ...invitation,
          details: [invitation.role ? roleLabels[invitation.role] : "", invitation.farmId ? (farmName.get(invitation.farmId) ?? "") : ""]
            .filter(Boolean)
            .join(" · "),
        }))}
        resendAction={resendInvitationAction}
        cancelAction={cancelInvitationAction}
      />
    </>
  );
}
