import Link from "next/link";

export default function NotFound() {
  return (
    <main id="main" className="mx-auto max-w-xl px-4 py-20 text-center">
      <h1 className="text-3xl font-bold">Page not found</h1>
      <p className="mt-3 text-loam-700">There is nothing at this address. It may have moved, or it may not be public.</p>
      <p className="mt-6"><Link href="/">Go to the Seedplot home page</Link></p>
    </main>
  );
}
