import type { Metadata } from "next";
import { ButtonLink } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { roleLabels } from "@/lib/auth/permissions";
import { listFarmPeople } from "@/lib/data/members";
import { timeDisplayFor } from "@/lib/time/member-display";
import { ActionForm } from "@/components/forms/action-form";
import {
  cancelGrowerInvitationAction,
  inviteGrowerAction,
  removeGrowerAction,
  resendGrowerInvitationAction,
  transferManagerAction,
} from "./actions";
import { OpenInvitations } from "../members/_components/open-invitations";

export const metadata: Metadata = { title: "Farm people" };

export default async function FarmPeoplePage() {
  const member = await requirePage("farm-staff:manage");
  const { people, invitations } = await listFarmPeople(member);
  const growers = people.filter((person) => person.role === "grower" && person.active);

  return (
    <>
      <PageHeader title="Farm people" lead={`Who records for ${member.farmName}. Only your farm's own people ever see its rows.`}>
        <ButtonLink href="/farm-people/data" variant="secondary">
          Your farm&apos;s data
        </ButtonLink>
      </PageHeader>
      <div className="grid grid-cols-1 gap-6 lg:grid-cols-2">
        <Card title="Invite a grower">
          <p className="mb-3 text-sm text-ink-soft">
            They get an e-mail with a link that works once, for 7 days, to choose their password.
          </p>
          <ActionForm
            action={inviteGrowerAction}
            testId="invite-grower"
            submitLabel="Send invitation"
            pendingLabel="Sending…"
            fields={[{ name: "email", label: "Their e-mail", type: "email" }]}
          />
        </Card>
        <Card title="Hand over the manager role">
          {growers.length === 0 ? (
            <p className="text-sm text-ink-soft">Invite a grower first: the manager role goes to one of your farm&apos;s growers.</p>
          ) : (
            <>
              <p className="mb-3 text-sm text-ink-soft">The grower you choose becomes the farm manager, and you become a grower.</p>
              <ActionForm
                action={transferManagerAction}
                testId="transfer-manager"
                submitLabel="Make them the manager"
                variant="danger"
                confirm="Hand over the manager role? You become a grower and cannot undo this yourself."
                fields={[
                  {
                    name: "userId",
                    label: "New farm manager",
                    options: growers.map((person) => ({ value: person.id, label: `${person.name} (${person.email})` })),
                  },
                ]}
              />
            </>
          )}
        </Card>
      </div>

      <h2 className="mt-10 mb-3 text-xl font-semibold text-moss-800">People of {member.farmName}</h2>
      <ul className="space-y-2" aria-label="Farm people">
        {people.map((person) => (
          <li
            key={person.id}
            className="flex flex-wrap items-center justify-between gap-3 rounded-lg border border-oat-300 bg-white px-4 py-3"
          >
            <div>
              <p className="font-medium">{person.name}</p>
              <p className="text-sm text-ink-soft">
                {person.email} · {roleLabels[person.role]}
                {person.active ? "" : " · removed"}
              </p>
            </div>
            {person.active && person.role === "grower" ? (
              <ActionForm
                action={removeGrowerAction}
                inline
                hidden={{ userId: person.id }}
                submitLabel="Remove"
                variant="danger"
                confirm={`Remove ${person.name}? They can no longer sign in.`}
              />
            ) : null}
          </li>
        ))}
      </ul>

      <OpenInvitations
        display={await timeDisplayFor(member)}
        invitations={invitations.map((invitation) => ({ ...invitation, details: "" }))}
        resendAction={resendGrowerInvitationAction}
        cancelAction={cancelGrowerInvitationAction}
      />
    </>
  );
}
