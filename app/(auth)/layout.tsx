import { Logo } from "@/components/logo";

export default function AuthLayout({ children }: { children: React.ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col">
      <main className="flex flex-1 items-start justify-center px-4 pt-[12vh]">
        <div className="w-full max-w-sm">
          <Logo size={34} className="mb-8" />
          {children}
        </div>
      </main>
      <footer className="px-6 py-4 text-xs text-silt-ink">
        Tributary — batches from many providers, checked against one data plan before they join the pool.
      </footer>
    </div>
  );
}
