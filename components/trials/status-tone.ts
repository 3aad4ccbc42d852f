import type { BadgeTone } from "@/components/ui/badge";
import type { TrialStatus } from "@/lib/domain/vocabulary/enums";

export const STATUS_TONE: Record<TrialStatus, BadgeTone> = {
  draft: "neutral",
  open: "info",
  collecting: "info",
  analysing: "warn",
  published: "good",
  archived: "neutral",
};
