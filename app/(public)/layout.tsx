import { NextIntlClientProvider } from "next-intl";
import { getMessages } from "next-intl/server";
import { PublicFooter, PublicHeader } from "@/components/layout/public-header";
import { getViewer } from "@/server/auth/guards";
import { clientMessages, PUBLIC_CLIENT_NAMESPACES } from "@/lib/domain/i18n/locales";

export default async function PublicLayout({ children }: { children: React.ReactNode }) {
  const [viewer, messages] = await Promise.all([getViewer(), getMessages()]);
  return (
    <>
      <PublicHeader signedIn={viewer !== null} />
      {/* the public tables' words and figures travel only with public pages */}
      <NextIntlClientProvider messages={clientMessages(messages, PUBLIC_CLIENT_NAMESPACES)}>
        <main id="main">{children}</main>
      </NextIntlClientProvider>
      <PublicFooter />
    </>
  );
}
