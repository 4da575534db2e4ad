import type { Metadata } from "next";
import { ActionForm } from "@/components/forms/action-form";
import { newPasswordFields } from "@/components/forms/password-fields";
import { PublicCard } from "../_components/public-card";
import { Notice } from "@/components/ui/notice";
import { setNewPasswordAction } from "../accept-invitation/actions";
import { getAccessTokenState } from "@/lib/data/members";
import { tokenRefusal } from "@/lib/members/tokens";
import { requestResetAction } from "./actions";

export const metadata: Metadata = { title: "Reset your password" };

export default async function ResetPasswordPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const token = (await searchParams).token;
  const requestForm = (
    <ActionForm
      action={requestResetAction}
      testId="request-reset"
      submitLabel="E-mail me a reset link"
      pendingLabel="Sending…"
      fields={[{ name: "email", label: "E-mail", type: "email", autoComplete: "username" }]}
    />
  );
  if (!token) {
    return (
      <PublicCard title="Reset your password">
        <p className="mb-4 text-sm text-ink-soft">Give the address you sign in with. We e-mail a link that works once, for one hour.</p>
        {requestForm}
      </PublicCard>
    );
  }
  const link = await getAccessTokenState(token);
  if (!link || link.purpose !== "password_reset" || link.state !== "valid") {
    return (
      <PublicCard title="This reset link cannot be used">
        <div className="mb-4">
          <Notice tone="danger">
            {tokenRefusal(!link || link.purpose !== "password_reset" || link.state === "valid" ? "unknown" : link.state, "password_reset")}
          </Notice>
        </div>
        {requestForm}
      </PublicCard>
    );
  }
  return (
    <PublicCard title="Choose a new password">
      <p className="mb-4 text-sm text-ink-soft">
        For <strong>{link.email}</strong>.
      </p>
      <ActionForm
        action={setNewPasswordAction}
        testId="new-password"
        submitLabel="Set new password"
        hidden={{ token }}
        fields={newPasswordFields("password", "New password")}
      />
    </PublicCard>
  );
}
