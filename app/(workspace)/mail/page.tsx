// The outgoing-mail page: what the local fake SMTP server received, secret links masked (lab leads;
// everyone in development; off in production unless EMBERLINE_MAIL_VIEWER=1).
import { notFound } from "next/navigation";
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { mailboxConfigured } from "@/lib/mail/mailbox";
import { fetchMailbox } from "@/lib/services/mailbox";
import { requireWorkspace } from "@/lib/services/workspace";

export const metadata = { title: "Outgoing mail" };
export const dynamic = "force-dynamic";

export default async function MailPage() {
  const { actor, canReadMail } = await requireWorkspace();
  if (!canReadMail) notFound();
  const messages = await fetchMailbox(actor);
  return (
    <>
      <PageHeader
        title="Outgoing mail"
        description="Messages Emberline sent through the local test mail server. Reset and invitation links are hidden from everyone but their recipient."
      />
      {!mailboxConfigured() ? (
        <EmptyState title="Mail goes to a real server">
          This installation sends mail through its SMTP settings.
        </EmptyState>
      ) : messages.length === 0 ? (
        <EmptyState title="No mail sent yet">
          Invitations, reset links, review requests and sign-offs appear here.
        </EmptyState>
      ) : (
        <ul className="flex flex-col gap-3">
          {messages.map((m) => (
            <li key={m.id} className="panel p-4">
              <details>
                <summary className="cursor-pointer">
                  <span className="font-medium">{m.subject}</span>
                  <span className="muted text-sm">
                    {" "}
                    — to {m.to.join(", ")}, {m.receivedAt.slice(0, 16).replace("T", " ")}
                  </span>
                </summary>
                <pre className="mt-3 text-sm whitespace-pre-wrap">{m.text}</pre>
              </details>
            </li>
          ))}
        </ul>
      )}
    </>
  );
}
