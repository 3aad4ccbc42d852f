import Link from "next/link";
import { Suspense } from "react";
import { NextIntlClientProvider } from "next-intl";
import { getLocale, getMessages, getTranslations } from "next-intl/server";
import { Logo } from "@/components/layout/logo";
import { LanguageSwitch } from "@/components/layout/language-switch";
import { withLanguage } from "@/lib/domain/i18n/language-choice";
import { AUTH_CLIENT_NAMESPACES, clientMessages } from "@/lib/domain/i18n/locales";

/** Nobody is signed in here, so these pages speak the address's language (`?lang=es`, as public pages do). */
export default async function AuthLayout({ children }: { children: React.ReactNode }) {
  const [t, locale, messages] = await Promise.all([getTranslations("auth"), getLocale(), getMessages()]);
  return (
    <main id="main" className="flex min-h-screen flex-col items-center bg-husk-100 px-4 py-10">
      <div className="mb-6 flex w-full max-w-md items-center justify-between gap-3">
        <Link href={withLanguage("/", locale)} className="no-underline" aria-label={t("home")}>
          <Logo />
        </Link>
        <Suspense>
          <LanguageSwitch />
        </Suspense>
      </div>
      <NextIntlClientProvider messages={clientMessages(messages, AUTH_CLIENT_NAMESPACES)}>
        <div className="w-full max-w-md rounded-2xl border border-husk-200 bg-white p-6 shadow-sm sm:p-8">{children}</div>
      </NextIntlClientProvider>
    </main>
  );
}
