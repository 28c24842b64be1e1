/** A calm placeholder while a server page loads: the shape of a header and a table. */
export function LoadingBlock({ label }: { label: string }) {
  return (
    <div aria-busy="true" aria-live="polite">
      <p className="sr-only">Loading {label}…</p>
      <div className="mb-6 border-b border-silt-line pb-4">
        <div className="h-7 w-72 animate-pulse rounded bg-sand-deep" />
        <div className="mt-2 h-4 w-96 animate-pulse rounded bg-sand-deep" />
      </div>
      <div className="space-y-2">
        {Array.from({ length: 6 }, (_, i) => (
          <div key={i} className="h-8 animate-pulse rounded bg-white" style={{ opacity: 1 - i * 0.12 }} />
        ))}
      </div>
      <p className="mt-3 text-sm text-silt-ink">Loading {label}…</p>
    </div>
  );
}
