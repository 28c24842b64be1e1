import Link from "next/link";
import { notFound } from "next/navigation";
import { PageHeader } from "@/components/ui/page-header";
import { requireUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/permissions";
import { LocalTime } from "@/components/ui/local-time";
import { getMailFor, mailboxEnabled } from "@/lib/mail/demo-mailbox";

export const metadata = { title: "E-mail" };
export const dynamic = "force-dynamic";

export default async function MailPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requireUser();
  if (!can(user.role, "mailbox.read") || !mailboxEnabled()) notFound();
  const { id } = await params;
  const m = await getMailFor(user, id);
  if (!m) notFound();
  return (
    <>
      <PageHeader
        eyebrow={
          <Link href="/mailbox" className="underline">
            Mailbox
          </Link>
        }
        title={m.subject}
        description={
          <>
            From {m.from} to {m.to.join(", ")}, <LocalTime value={m.receivedAt} />
          </>
        }
      />
      <pre
        className="whitespace-pre-wrap rounded border border-silt-line bg-white p-4 font-sans text-base"
        data-testid="mail-text"
      >
        {linkify(m.text)}
      </pre>
    </>
  );
}

/** Plain text with its links made clickable (the text part is what every client can show). */
function linkify(text: string) {
  return text.split(/(https?:\/\/[^\s]+)/g).map((part, i) =>
    /^https?:\/\//.test(part) ? (
      <a key={i} href={part} className="text-channel underline">
        {part}
      </a>
    ) : (
      part
    ),
  );
}
