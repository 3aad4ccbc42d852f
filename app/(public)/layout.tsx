import { PublicFooter, PublicHeader } from "@/components/layout/public-header";
import { getViewer } from "@/server/auth/guards";

export default async function PublicLayout({ children }: { children: React.ReactNode }) {
  const viewer = await getViewer();
  return (
    <>
      <PublicHeader signedIn={viewer !== null} />
      <main id="main">{children}</main>
      <PublicFooter />
    </>
  );
}
