"use client";
import { useState } from "react";
import { signOut } from "next-auth/react";
import { Dialog } from "@/components/ui/dialog";
import { Button } from "@/components/ui/button";
import { clearPhone, countWaitingOnPhone } from "@/components/offline/phone-store";
import { useTranslations } from "next-intl";

/** Signing out empties what the phone keeps (values waiting, kept pages); values not sent yet are named first. */
export function SignOutButton({ userId }: { userId: number }) {
  const t = useTranslations("nav");
  const tOffline = useTranslations("offline");
  const [waiting, setWaiting] = useState(0);
  async function leave() {
    await clearPhone().catch(() => undefined);
    await signOut({ callbackUrl: "/" });
  }
  async function start() {
    const n = await countWaitingOnPhone(userId).catch(() => 0);
    if (n > 0) setWaiting(n);
    else await leave();
  }
  return (
    <>
      <button type="button" onClick={() => void start()} className="min-h-11 rounded-lg px-3 font-semibold text-loam-700 hover:bg-husk-100">
        {t("signOut")}
      </button>
      {waiting > 0 && (
        <Dialog title={tOffline("signOutTitle")} onClose={() => setWaiting(0)}>
          <p>{tOffline("signOutWarning", { count: waiting })}</p>
          <div className="flex flex-wrap gap-2">
            <Button type="button" onClick={() => setWaiting(0)}>
              {tOffline("stayHere")}
            </Button>
            <Button type="button" variant="secondary" onClick={() => void leave()}>
              {tOffline("signOutAnyway", { count: waiting })}
            </Button>
          </div>
        </Dialog>
      )}
    </>
  );
}
