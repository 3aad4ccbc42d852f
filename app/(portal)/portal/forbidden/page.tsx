import Link from "next/link";

export const metadata = { title: "No access" };

export default function ForbiddenPage() {
  return (
    <div className="rounded-xl border border-marigold-400 bg-marigold-100 p-6">
      <h1 className="text-2xl font-bold">You don't have access to that page</h1>
      <p className="mt-2">That page is for program staff. If you think you should see it, ask your trial coordinator.</p>
      <p className="mt-4"><Link href="/portal">Back to your portal home</Link></p>
    </div>
  );
}
