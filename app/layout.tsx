import type { Metadata, Viewport } from "next";
import localFont from "next/font/local";
import { NextIntlClientProvider } from "next-intl";
import { getLocale, getMessages, getTranslations } from "next-intl/server";
import { clientMessages } from "@/lib/domain/i18n/locales";
import "./globals.css";

// Inter is shipped with the app (public/fonts, SIL Open Font License); nothing is downloaded at build.
const inter = localFont({
  src: [
    { path: "../public/fonts/inter/inter-latin-400-normal.woff2", weight: "400", style: "normal" },
    { path: "../public/fonts/inter/inter-latin-600-normal.woff2", weight: "600", style: "normal" },
    { path: "../public/fonts/inter/inter-latin-700-normal.woff2", weight: "700", style: "normal" },
  ],
  variable: "--font-inter",
  display: "swap",
});

// Every page is rendered per request so Next can put the CSP nonce from proxy.ts on its scripts.
export const dynamic = "force-dynamic";

export const metadata: Metadata = {
  title: { default: "Seedplot · On-farm variety trials", template: "%s · Seedplot" },
  description:
    "Seedplot runs the Tamarack Valley Extension District's on-farm vegetable and flower variety trials with partner farms and gardens, and publishes the results for growers.",
  icons: { icon: "/icons/icon-192.png", apple: "/icons/apple-touch-icon.png" },
};

export const viewport: Viewport = { width: "device-width", initialScale: 1, themeColor: "#1b5c2e" };

export default async function RootLayout({ children }: { children: React.ReactNode }) {
  const [locale, t, messages] = await Promise.all([getLocale(), getTranslations("common"), getMessages()]);
  return (
    <html lang={locale} className={inter.variable}>
      <body className="min-h-screen font-sans">
        <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:rounded focus:bg-white focus:px-3 focus:py-2">
          {t("skipToContent")}
        </a>
        <NextIntlClientProvider messages={clientMessages(messages)}>{children}</NextIntlClientProvider>
      </body>
    </html>
  );
}
