"use client";

export default function PublicError({ retry }: { error: unknown; retry: () => void }) {
  return (
    <div role="alert" className="mx-auto max-w-xl px-4 py-16 text-center">
      <h1 className="text-2xl font-bold">This page could not load</h1>
      <p className="mt-2 text-loam-700">Seedplot is having trouble reaching its data. Please try again in a minute.</p>
      <button type="button" onClick={retry} className="mt-6 min-h-11 rounded-lg bg-sprout-600 px-4 font-semibold text-white">
        Try again
      </button>
    </div>
  );
}
