import Link from "next/link";
import { Logo } from "@/components/logo";

export const metadata = { title: "Page not found" };

export default function NotFound() {
  return (
    <main className="mx-auto flex min-h-screen max-w-xl flex-col justify-center px-6">
      <Logo />
      <h1 className="mt-8 text-2xl font-semibold">This page is not here</h1>
      <p className="mt-2 text-md text-ink-soft">
        The address may be mistyped, or the page may belong to a study or batch you are not part of.
      </p>
      <p className="mt-6">
        <Link href="/" className="font-semibold">
          Go to your home page
        </Link>
      </p>
    </main>
  );
}
