import type { Metadata } from "next";
import { ButtonLink } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { can, roleLabels } from "@/lib/auth/permissions";
import { getAccountSettings } from "@/lib/data/members";
import { ActionForm } from "@/components/forms/action-form";
import { newPasswordFields } from "@/components/forms/password-fields";
import { dateStyles, dateStyleNames, timeZoneNames } from "@/lib/time/display";
import { timeDisplayFor } from "@/lib/time/member-display";
import { changePasswordAction, signOutEverywhereAction, updatePreferencesAction } from "./actions";

export const metadata: Metadata = { title: "Settings" };

export default async function SettingsPage() {
  const member = await requirePage("account:manage");
  const account = await getAccountSettings(member);
  const browserZone = (await timeDisplayFor({ timeZone: null, dateStyle: account.dateStyle })).timeZone;
  return (
    <>
      <PageHeader
        title="Settings"
        lead={`${account.name} · ${account.email} · ${roleLabels[member.role]}${member.farmName ? ` at ${member.farmName}` : ""}`}
      />
      <div className="grid grid-cols-1 gap-6 lg:grid-cols-2">
        <Card title="Display and e-mail">
          <ActionForm
            action={updatePreferencesAction}
            testId="preferences"
            submitLabel="Save preferences"
            fields={[
              {
                name: "displayUnits",
                label: "Show masses in",
                defaultValue: account.displayUnits,
                options: [
                  { value: "metric", label: "Metric (g, kg)" },
                  { value: "imperial", label: "Imperial (oz, lb)" },
                ],
              },
              {
                name: "timeZone",
                label: "Show times in",
                defaultValue: account.timeZone ?? "",
                options: [
                  { value: "", label: `This browser's time zone (${browserZone})` },
                  ...timeZoneNames().map((zone) => ({ value: zone, label: zone.replaceAll("_", " ") })),
                ],
                hint: "E-mails use the zone chosen here; until you choose one they give times in UTC.",
              },
              {
                name: "dateStyle",
                label: "Write dates as",
                defaultValue: account.dateStyle,
                options: dateStyleNames.map((style) => ({ value: style, label: dateStyles[style] })),
              },
              {
                name: "notifyReminders",
                label: "E-mail me reminders (missing season logs, trial deadlines)",
                type: "checkbox",
                defaultChecked: account.notifyReminders,
              },
            ]}
          />
          <p className="mt-3 text-xs text-ink-soft">
            Invitations, password resets and role changes are always e-mailed: they concern your access.
          </p>
        </Card>
        <Card title="Change password">
          <ActionForm
            action={changePasswordAction}
            testId="change-password"
            submitLabel="Change password"
            fields={[
              { name: "currentPassword", label: "Current password", type: "password", autoComplete: "current-password" },
              ...newPasswordFields("newPassword", "New password"),
            ]}
          />
        </Card>
        <Card title="Where you are signed in">
          <p className="mb-3 text-sm">
            Lost a phone, or signed in on a shared computer? This signs you out on every device and browser, this one too. Changing your
            password does the same on every other device.
          </p>
          <ActionForm
            action={signOutEverywhereAction}
            testId="sign-out-everywhere"
            hidden={{ scope: "everywhere" }}
            submitLabel="Sign out everywhere"
            pendingLabel="Signing out…"
            variant="secondary"
          />
        </Card>
        {can(member.role, "farm-data:export") ? (
          <Card title="Your farm's data">
            <p className="mb-3 text-sm">Download everything {member.farmName} gave the co-op, or withdraw it.</p>
            <ButtonLink href="/farm-people/data" variant="secondary">
              Download or withdraw
            </ButtonLink>
          </Card>
        ) : null}
      </div>
    </>
  );
}
