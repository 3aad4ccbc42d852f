"use client";
import { useActionState, useEffect } from "react";
import { useQueryClient } from "@tanstack/react-query";
import { setDirection } from "@/server/actions/trials";
import { directionLabel, orderWords } from "@/lib/domain/analysis/ranking";
import { BETTER_WHEN, type BetterWhen } from "@/lib/domain/vocabulary/enums";
import { SubmitButton } from "@/components/ui/submit-button";
import { FormMessage } from "@/components/ui/form-message";

const CHOICE_WORDS: Record<BetterWhen, string> = { higher: "Higher is better", lower: "Lower is better", neither: "No preference" };

/** Which way is better for the trait shown: what every ranking and "best" claim on the page follows. */
export function DirectionPanel({ trialId, trait, editable }: { trialId: number; trait: { id: number; name: string; betterWhen: BetterWhen; computation: string }; editable: boolean }) {
  const client = useQueryClient();
  const [state, action] = useActionState(setDirection, null);
  useEffect(() => {
    if (state?.ok) void client.invalidateQueries({ queryKey: ["analysis", trialId] });
  }, [state, client, trialId]);
  const summary = `${directionLabel(trait.betterWhen)}: entries are listed ${orderWords(trait)}${trait.betterWhen === "neither" ? " and none is ranked or called best" : ""}.`;
  if (!editable) return <p className="text-sm text-loam-700">{summary}</p>;
  return (
    <form action={action} className="space-y-2" key={`${trait.id}-${trait.betterWhen}`}>
      <input type="hidden" name="trialId" value={trialId} />
      <input type="hidden" name="traitId" value={trait.id} />
      <label htmlFor="betterWhen" className="block text-sm font-semibold">
        Which way is better for {trait.name.toLowerCase()}?
      </label>
      <div className="flex flex-wrap items-center gap-2">
        <select id="betterWhen" name="betterWhen" defaultValue={trait.betterWhen} className="block min-h-11 min-w-0 max-w-full rounded-lg border border-loam-300 bg-white px-3 text-base">
          {BETTER_WHEN.map((b) => (
            <option key={b} value={b}>
              {CHOICE_WORDS[b]}
            </option>
          ))}
          <option value="default">Trait library default</option>
        </select>
        <SubmitButton variant="secondary" pendingText="Saving…">
          Save direction
        </SubmitButton>
      </div>
      <p className="text-sm text-loam-700">
        {summary} Usual choices: yield and quality higher; days to emergence and defects lower; days to maturity no preference, since earlier
        or later can each suit a grower.
      </p>
      <FormMessage state={state} />
    </form>
  );
}
