export default function Loading() {
  return (
    <div aria-busy="true" aria-live="polite" className="space-y-4">
      <span className="sr-only">Running the analysis…</span>
      <div className="h-9 w-80 animate-pulse rounded bg-husk-200" />
      <div className="h-48 animate-pulse rounded-xl bg-husk-100" />
      <div className="grid gap-4 xl:grid-cols-2">
        <div className="h-72 animate-pulse rounded-xl bg-husk-100" />
        <div className="h-72 animate-pulse rounded-xl bg-husk-100" />
      </div>
    </div>
  );
}
