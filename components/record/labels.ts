import type { BadgeTone } from "@/components/ui/badge";
import type { SubmissionStatus } from "@/lib/domain/vocabulary/enums";

export const SUBMISSION_LABELS: Record<SubmissionStatus, string> = {
  draft: "Being recorded",
  submitted: "Sent for review",
  returned: "Returned for corrections",
  accepted: "Accepted",
};

export const SUBMISSION_TONES: Record<SubmissionStatus, BadgeTone> = { draft: "neutral", submitted: "info", returned: "warn", accepted: "good" };
