"use client";
import { useActionState, useEffect } from "react";
import { useQueryClient } from "@tanstack/react-query";
import { shareSiteResults } from "@/server/actions/exclusions";
import type { SiteChoice } from "@/lib/domain/analysis/types";
import { SubmitButton } from "@/components/ui/submit-button";
import { FormMessage } from "@/components/ui/form-message";

/** Per site: whether its cooperators may see their own site's analysis, with a button to change it. */
export function SharingPanel({ trialId, sites }: { trialId: number; sites: SiteChoice[] }) {
  const client = useQueryClient();
  const [state, action] = useActionState(shareSiteResults, null);
  useEffect(() => {
    if (state?.ok) void client.invalidateQueries({ queryKey: ["analysis", trialId] });
  }, [state, client, trialId]);
  return (
    <div className="space-y-3">
      <p className="text-sm text-loam-700">Growers only ever see their own site, with blind codes, and only after you share it here.</p>
      <ul className="space-y-2">
        {sites.map((s) => (
          <li key={s.id} className="flex flex-wrap items-center justify-between gap-2 border-b border-husk-200 pb-2">
            <span>
              <strong>{s.name}</strong> — {s.shared ? "shared with its growers" : "not shared"}
            </span>
            <form action={action}>
              <input type="hidden" name="trialId" value={trialId} />
              <input type="hidden" name="siteId" value={s.id} />
              <input type="hidden" name="shared" value={s.shared ? "0" : "1"} />
              <SubmitButton variant="secondary" pendingText="Saving…">
                {s.shared ? `Stop sharing ${s.name}` : `Share with ${s.name}`}
              </SubmitButton>
            </form>
          </li>
        ))}
      </ul>
      <FormMessage state={state} />
    </div>
  );
}
