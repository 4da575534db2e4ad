import type { Metadata } from "next";
import { Card } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { requirePage } from "@/lib/auth/guard";
import { listOutgoingMail } from "@/lib/data/trials";

export const metadata: Metadata = { title: "Outgoing mail" };

export default async function OutgoingMailPage() {
  const member = await requirePage("mail:read-outgoing");
  const messages = await listOutgoingMail(member);
  return (
    <>
      <PageHeader
        title="Outgoing mail"
        lead="What Rhizomorph would have e-mailed, caught by the local mail catcher. Newest first; the latest 200."
      />
      {messages.length === 0 ? (
        <Card>
          <p className="text-ink-soft">No mail has been sent yet. Inviting farms to a trial sends the first.</p>
        </Card>
      ) : (
        <ol className="space-y-4" data-testid="outgoing-mail">
          {messages.map((message) => (
            <li key={message.id}>
              <Card>
                <details>
                  <summary className="flex min-h-11 cursor-pointer flex-col justify-center">
                    <span className="font-semibold text-moss-800">{message.subject || "(no subject)"}</span>
                    <span className="text-sm text-ink-soft">
                      To {message.recipients.join(", ")} · {message.receivedAt.toISOString().slice(0, 16).replace("T", " ")} UTC
                    </span>
                  </summary>
                  <div className="mt-4 grid gap-4 lg:grid-cols-2">
                    <div>
                      <h3 className="mb-1 text-sm font-semibold">Plain text</h3>
                      <pre className="overflow-x-auto whitespace-pre-wrap rounded-lg bg-oat-50 p-3 text-sm">{message.text}</pre>
                    </div>
                    <div>
                      <h3 className="mb-1 text-sm font-semibold">HTML</h3>
                      {/* Sandboxed with no permissions: the message's HTML can neither run scripts nor reach this page. */}
                      <iframe
                        title={`HTML part of "${message.subject}"`}
                        sandbox=""
                        srcDoc={message.html}
                        className="h-72 w-full rounded-lg border border-oat-300 bg-white"
                      />
                    </div>
                  </div>
                </details>
              </Card>
            </li>
          ))}
        </ol>
      )}
    </>
  );
}
