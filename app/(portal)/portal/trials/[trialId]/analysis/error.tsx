"use client";

export default function AnalysisError({ retry }: { error: unknown; retry: () => void }) {
  return (
    <div role="alert" className="rounded-xl border border-beet-600 bg-beet-50 p-6">
      <h1 className="text-xl font-bold text-beet-700">The analysis could not be shown</h1>
      <p className="mt-2 text-loam-900">Your data are safe. Try again; if it keeps failing, check the trial&apos;s latest uploads for odd values.</p>
      <button type="button" onClick={retry} className="mt-4 min-h-11 rounded-lg bg-sprout-600 px-4 font-semibold text-white">
        Try again
      </button>
    </div>
  );
}
