"use client";
import { useActionState } from "react";
import { moveTrait } from "@/server/actions/trials";
import { FormMessage } from "@/components/ui/form-message";
import { SubmitButton } from "@/components/ui/submit-button";

/** The trial's traits in the order growers record them, each with buttons to move it up or down. */
export function TraitOrder({ trialId, traits, editable }: { trialId: number; traits: { id: number; name: string }[]; editable: boolean }) {
  const [state, action] = useActionState(moveTrait, null);
  if (traits.length === 0) return <span>None chosen yet</span>;
  return (
    <div>
      <ol className="list-decimal space-y-1 pl-5">
        {traits.map((t, i) => (
          <li key={t.id}>
            <span className="inline-flex flex-wrap items-center gap-2">
              <span>{t.name}</span>
              {editable &&
                (["up", "down"] as const).map((direction) =>
                  (direction === "up" && i === 0) || (direction === "down" && i === traits.length - 1) ? null : (
                    <form key={direction} action={action} className="inline">
                      <input type="hidden" name="trialId" value={trialId} />
                      <input type="hidden" name="traitId" value={t.id} />
                      <input type="hidden" name="direction" value={direction} />
                      <SubmitButton variant="ghost" pendingText="…">
                        <span aria-hidden>{direction === "up" ? "↑" : "↓"}</span>
                        <span className="sr-only">
                          Move {t.name} {direction}
                        </span>
                      </SubmitButton>
                    </form>
                  ),
                )}
            </span>
          </li>
        ))}
      </ol>
      <FormMessage state={state} />
    </div>
  );
}
