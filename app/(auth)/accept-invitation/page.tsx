import type { Metadata } from "next";
import { ActionForm } from "@/components/forms/action-form";
import { newPasswordFields } from "@/components/forms/password-fields";
import { Notice } from "@/components/ui/notice";
import { roleLabels } from "@/lib/auth/permissions";
import { getAccessTokenState } from "@/lib/data/members";
import { tokenRefusal } from "@/lib/members/tokens";
import { acceptInvitationAction } from "./actions";
import { PublicCard } from "../_components/public-card";

export const metadata: Metadata = { title: "Accept your invitation" };

export default async function AcceptInvitationPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const token = (await searchParams).token ?? "";
  const link = await getAccessTokenState(token);
  if (!link || link.purpose !== "invitation" || link.state !== "valid") {
    const state = !link || link.purpose !== "invitation" ? "unknown" : link.state === "valid" ? "unknown" : link.state;
    return (
      <PublicCard title="This invitation cannot be used">
        <Notice tone="danger">{tokenRefusal(state, "invitation")}</Notice>
      </PublicCard>
    );
  }
  return (
    <PublicCard title="Accept your invitation">
      <p className="mb-4 text-sm text-ink-soft">
        You are joining {link.farmName ? <strong>{link.farmName}</strong> : "the co-op"} as{" "}
        {link.role ? roleLabels[link.role].toLowerCase() : "a member"}, signing in as <strong>{link.email}</strong>. Choose your password;
        the link then stops working.
      </p>
      <ActionForm
        action={acceptInvitationAction}
        testId="accept-invitation"
        submitLabel="Set password and join"
        hidden={{ token }}
        fields={[{ name: "name", label: "Your name", autoComplete: "name" }, ...newPasswordFields("password", "Password")]}
      />
    </PublicCard>
  );
}
