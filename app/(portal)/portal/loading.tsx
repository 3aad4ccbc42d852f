export default function Loading() {
  return (
    <div aria-busy="true" aria-live="polite" className="space-y-4">
      <span className="sr-only">Loading…</span>
      <div className="h-8 w-64 animate-pulse rounded bg-husk-200" />
      <div className="h-40 animate-pulse rounded-xl bg-husk-100" />
      <div className="h-40 animate-pulse rounded-xl bg-husk-100" />
    </div>
  );
}
