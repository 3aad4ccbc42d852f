/** Seedplot's mark: a seedling rising from a plot grid. */
export function Logo({ className = "" }: { className?: string }) {
  return (
    <span className={`inline-flex items-center gap-2 font-bold tracking-tight text-loam-900 ${className}`}>
      <svg aria-hidden viewBox="0 0 32 32" className="size-8">
        <rect x="2" y="18" width="28" height="12" rx="3" className="fill-husk-200" />
        <path d="M9 18v12M16 18v12M23 18v12" className="stroke-husk-400" strokeWidth="1.5" />
        <path d="M16 20V10" className="stroke-sprout-600" strokeWidth="2.5" strokeLinecap="round" />
        <path d="M16 12c-5 0-8-3-8-7 5 0 8 3 8 7zM16 14c4 0 7-2.5 7-6-4 0-7 2.5-7 6z" className="fill-sprout-500" />
      </svg>
      <span className="text-xl">Seedplot</span>
    </span>
  );
}
