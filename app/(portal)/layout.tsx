import { requireUser } from "@/lib/auth/session";
import { TopBar } from "@/components/portal/top-bar";

/** Every signed-in page: the top bar, then the page. The session is checked here and again in each page. */
export default async function PortalLayout({ children }: { children: React.ReactNode }) {
  const user = await requireUser();
  return (
    <div className="flex min-h-screen flex-col">
      <a
        href="#main"
        className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-10 focus:bg-white focus:p-2"
      >
        Skip to content
      </a>
      <TopBar user={user} />
      <main id="main" className="mx-auto w-full min-w-0 max-w-page flex-1 px-4 py-6 sm:px-6">
        {children}
      </main>
    </div>
  );
}
