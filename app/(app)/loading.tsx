export default function Loading() {
  return (
    <div role="status" aria-live="polite" className="animate-pulse space-y-4">
      <div className="h-7 w-56 rounded bg-ink-200" />
      <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
        {[0, 1, 2, 3].map((i) => (
          <div key={i} className="h-24 rounded-lg bg-ink-200/70" />
        ))}
      </div>
      <div className="h-64 rounded-lg bg-ink-200/60" />
      <span className="sr-only">Loading…</span>
    </div>
  );
}
