/** Invitations sent but not yet accepted, each with what it is for and how long its link lasts. */
export function OpenInvitations({ invitations }: { invitations: { id: string; email: string; details: string; expiresAt: Date }[] }) {
  return (
    <>
      <h2 className="mt-10 mb-3 text-xl font-semibold text-moss-800">Open invitations</h2>
      {invitations.length === 0 ? (
        <p className="text-ink-soft">No invitations are waiting.</p>
      ) : (
        <ul className="space-y-2" aria-label="Open invitations">
          {invitations.map((invitation) => (
            <li key={invitation.id} className="rounded-lg border border-oat-300 bg-white px-4 py-3 text-sm">
              <span className="font-medium">{invitation.email}</span>
              {invitation.details ? ` · ${invitation.details}` : ""} · link good until {invitation.expiresAt.toISOString().slice(0, 10)}
            </li>
          ))}
        </ul>
      )}
    </>
  );
}
