import Link from "next/link";
import { Logo } from "@/components/logo";
import { ApiReferenceViewer } from "@/components/api-reference/api-reference-viewer";

export const metadata = { title: "API reference" };

/**
 * The API reference, public like the document it shows (/api/v1/openapi.json describes the API
 * and holds no data), so a script's author can read it before they have an account.
 */
export default function ApiReferencePage() {
  return (
    <div className="flex min-h-screen flex-col">
      <header className="border-b border-silt-line bg-white px-4 py-3 sm:px-6">
        <div className="mx-auto flex max-w-page items-center justify-between gap-4">
          <Link href="/" aria-label="Tributary home">
            <Logo size={26} />
          </Link>
          <Link
            href="/settings#tokens"
            className="text-base text-channel-deep underline-offset-2 hover:underline"
          >
            Your API tokens
          </Link>
        </div>
      </header>
      <main id="main" className="mx-auto w-full min-w-0 max-w-page flex-1 px-4 py-6 sm:px-6">
        <h1 className="text-2xl font-semibold">API reference</h1>
        <p className="mt-1 max-w-3xl text-base text-ink-soft">
          Every route under <code>/api/v1</code>, drawn from the OpenAPI 3.1 document the API serves at{" "}
          <a className="text-channel-deep underline" href="/api/v1/openapi.json">
            /api/v1/openapi.json
          </a>
          . Send a personal API token as <code>Authorization: Bearer trb_…</code>; a token can do what its
          owner can in the pages, no more.
        </p>
        <div className="mt-6">
          <ApiReferenceViewer />
        </div>
      </main>
    </div>
  );
}
