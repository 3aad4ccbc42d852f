export default function Loading() {
  return (
    <div aria-busy="true" aria-live="polite" className="space-y-4">
      <span className="sr-only">Gathering this variety&apos;s trials…</span>
      <div className="h-9 w-72 animate-pulse rounded bg-husk-200" />
      <div className="h-32 animate-pulse rounded-xl bg-husk-100" />
      <div className="h-32 animate-pulse rounded-xl bg-husk-100" />
    </div>
  );
}
