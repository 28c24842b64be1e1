import Link from "next/link";
import { SetPasswordForm } from "@/components/settings/link-forms";
import { PASSWORD_MIN_LENGTH } from "@/lib/auth/password-rules";
import { describeLink } from "@/lib/people/commands-links";
import { setPasswordAction } from "../../link-actions";

export const metadata = { title: "Choose a password" };
export const dynamic = "force-dynamic";

export default async function SetPasswordPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const link = await describeLink(token);
  if (!link) {
    return (
      <>
        <h1 className="text-2xl font-semibold">This link no longer works</h1>
        <p className="mt-2 text-base">
          It has expired or was already used.{" "}
          <Link href="/forgot-password" className="text-channel underline">
            Ask for a new link
          </Link>
          , or ask the person who invited you.
        </p>
      </>
    );
  }
  return (
    <>
      <h1 className="text-2xl font-semibold">
        {link.kind === "invite" ? `Welcome, ${link.name}` : "Choose a new password"}
      </h1>
      <p className="mt-1 mb-6 text-md text-ink-soft">For {link.email}.</p>
      <SetPasswordForm token={token} minLength={PASSWORD_MIN_LENGTH} save={setPasswordAction} />
    </>
  );
}
