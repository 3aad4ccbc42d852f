import Link from "next/link";
import { Logo } from "@/components/layout/logo";

export default function AuthLayout({ children }: { children: React.ReactNode }) {
  return (
    <main id="main" className="flex min-h-screen flex-col items-center bg-husk-100 px-4 py-10">
      <Link href="/" className="mb-6 no-underline" aria-label="Seedplot home">
        <Logo />
      </Link>
      <div className="w-full max-w-md rounded-2xl border border-husk-200 bg-white p-6 shadow-sm sm:p-8">{children}</div>
    </main>
  );
}
