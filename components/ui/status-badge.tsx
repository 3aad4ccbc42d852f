import { Badge } from "@/components/ui/badge";
import type { SubmissionStatus, TrialStatus } from "@/lib/domain/vocabulary/enums";
import { STATUS_LABELS, STATUS_TONES, SUBMISSION_LABELS, SUBMISSION_TONES } from "@/lib/domain/vocabulary/statuses";

/** A trial's status in its words and its one tone. */
export function TrialStatusBadge({ status }: { status: TrialStatus }) {
  return <Badge tone={STATUS_TONES[status]}>{STATUS_LABELS[status]}</Badge>;
}

/** A site's data status (being recorded, sent for review, returned, accepted) in its words and its one tone. */
export function SubmissionStatusBadge({ status }: { status: SubmissionStatus }) {
  return <Badge tone={SUBMISSION_TONES[status]}>{SUBMISSION_LABELS[status]}</Badge>;
}
