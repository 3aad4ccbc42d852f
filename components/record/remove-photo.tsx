"use client";
import { useTranslations } from "next-intl";
import { ConfirmAction } from "@/components/ui/confirm-action";
import { removePhoto } from "@/server/actions/photos";

/** Removes one photo of the site after a second thought; the page shows the list without it. */
export function RemovePhoto({ photoId, trialId, siteId, name }: { photoId: number; trialId: number; siteId: number; name: string }) {
  const t = useTranslations("photos");
  return (
    <ConfirmAction
      label={t("remove")}
      srLabel={t("removeWhich", { name })}
      title={t("removeTitle")}
      confirmLabel={t("removeConfirm")}
      pendingText={t("removing")}
      cancelLabel={t("keep")}
      closeLabel={t("close")}
      action={removePhoto}
      fields={{ photoId, trialId, siteId }}
      onDone={() => undefined}
    >
      <p>{t("removeBody")}</p>
    </ConfirmAction>
  );
}
