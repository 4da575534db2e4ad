import type { ActionState } from "@/lib/auth/guard";
import { ActionForm } from "@/components/forms/action-form";
import { formatDateTime, type TimeDisplay } from "@/lib/time/display";

type InvitationAction = (state: ActionState, formData: FormData) => Promise<ActionState>;

/**
 * Invitations sent but not yet accepted, each with what it is for and how long its link lasts,
 * and buttons to send it again (a new link; the old one stops working) or to cancel it.
 */
export function OpenInvitations({
  invitations,
  resendAction,
  cancelAction,
  display,
}: {
  invitations: { id: string; email: string; details: string; expiresAt: Date }[];
  resendAction: InvitationAction;
  cancelAction: InvitationAction;
  display: TimeDisplay;
}) {
  return (
    <>
      <h2 className="mt-10 mb-3 text-xl font-semibold text-moss-800">Open invitations</h2>
      {invitations.length === 0 ? (
        <p className="text-ink-soft">No invitations are waiting.</p>
      ) : (
        <ul className="space-y-2" aria-label="Open invitations">
          {invitations.map((invitation) => (
            <li
              key={invitation.id}
              className="flex flex-wrap items-center justify-between gap-3 rounded-lg border border-oat-300 bg-white px-4 py-3 text-sm"
            >
              <span>
                <span className="font-medium">{invitation.email}</span>
                {invitation.details ? ` · ${invitation.details}` : ""} · link good until {formatDateTime(invitation.expiresAt, display)}
              </span>
              <span className="flex flex-wrap gap-2">
                <ActionForm
                  action={resendAction}
                  inline
                  testId={`resend-${invitation.email}`}
                  hidden={{ invitationId: invitation.id }}
                  submitLabel="Send again"
                  pendingLabel="Sending…"
                  variant="secondary"
                />
                <ActionForm
                  action={cancelAction}
                  inline
                  testId={`cancel-${invitation.email}`}
                  hidden={{ invitationId: invitation.id }}
                  submitLabel="Cancel invitation"
                  variant="danger"
                  confirm={`Cancel the invitation to ${invitation.email}? Its link stops working.`}
                />
              </span>
            </li>
          ))}
        </ul>
      )}
    </>
  );
}
