import { LocalTime } from "@/components/ui/local-time";
import Link from "next/link";
import { notFound } from "next/navigation";
import { PageHeader } from "@/components/ui/page-header";
import { EmptyState } from "@/components/ui/empty-state";
import { requireUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/permissions";
import { listMailFor, mailboxEnabled } from "@/lib/mail/demo-mailbox";

export const metadata = { title: "Demo mailbox" };
export const dynamic = "force-dynamic";

export default async function MailboxPage() {
  const user = await requireUser();
  if (!can(user.role, "mailbox.read") || !mailboxEnabled()) notFound();
  const mail = await listMailFor(user);
  return (
    <>
      <PageHeader
        eyebrow="Demo only"
        title="Mailbox"
        description={`The e-mail Tributary sent to ${user.role === "admin" ? "anyone" : user.email}, as the local mail server received it. A real installation sends to people's own inboxes instead.`}
      />
      {mail.length ? (
        <ul
          className="divide-y divide-silt-line rounded border border-silt-line bg-white"
          data-testid="mailbox"
        >
          {mail.map((m) => (
            <li key={m.id}>
              <Link
                href={`/mailbox/${m.id}`}
                className="grid grid-cols-1 gap-0.5 px-4 py-2 hover:bg-channel-wash sm:grid-cols-[1fr_auto]"
              >
                <span className="font-semibold">{m.subject}</span>
                <span className="text-sm text-silt-ink tabular-nums">
                  <LocalTime value={m.receivedAt} />
                </span>
                <span className="text-sm text-silt-ink">to {m.to.join(", ")}</span>
              </Link>
            </li>
          ))}
        </ul>
      ) : (
        <EmptyState title="No e-mail yet">
          Decisions, invitations and password resets addressed to you appear here.
        </EmptyState>
      )}
    </>
  );
}
