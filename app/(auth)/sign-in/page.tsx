import { redirect } from "next/navigation";
import { getCurrentUser } from "@/lib/auth/session";
import { SignInForm } from "./sign-in-form";

export const metadata = { title: "Sign in" };

/** Only same-site paths are followed after sign-in (no open redirect). */
function safeNext(v: string | string[] | undefined): string {
  const s = Array.isArray(v) ? v[0] : v;
  if (!s || !s.startsWith("/") || s.startsWith("//") || s.startsWith("/\\")) return "/";
  return s;
}

export default async function SignInPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const sp = await searchParams;
  const next = safeNext(sp.callbackUrl ?? sp.next);
  if (await getCurrentUser()) redirect(next);
  const error = Array.isArray(sp.error) ? sp.error[0] : sp.error;
  // only known notices are shown, so a crafted link cannot put its own words here
  const notice =
    sp.notice === "password-changed" ? "Your password was changed. Sign in with the new one." : null;
  return (
    <>
      <h1 className="text-2xl font-semibold">Sign in</h1>
      <p className="mt-1 mb-6 text-md text-ink-soft">
        Use the e-mail address your study team registered for you.
      </p>
      {notice ? (
        <p
          role="status"
          className="mb-4 rounded border border-reed/40 bg-reed-wash px-3 py-2 text-sm text-reed-ink"
        >
          {notice}
        </p>
      ) : null}
      <SignInForm next={next} initialError={error ?? null} />
    </>
  );
}
