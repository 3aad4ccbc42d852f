"use client";
import { ConfirmAction } from "@/components/ui/confirm-action";
import { removePhoto } from "@/server/actions/photos";

/** Removes one photo of the site after a second thought; the page shows the list without it. */
export function RemovePhoto({ photoId, trialId, siteId, name }: { photoId: number; trialId: number; siteId: number; name: string }) {
  return (
    <ConfirmAction
      label="Remove"
      srLabel={`photo: ${name}`}
      title="Remove this photo?"
      confirmLabel="Remove photo"
      pendingText="Removing…"
      action={removePhoto}
      fields={{ photoId, trialId, siteId }}
      onDone={() => undefined}
    >
      <p>The photo is deleted for everyone who can see this site. This cannot be undone.</p>
    </ConfirmAction>
  );
}
