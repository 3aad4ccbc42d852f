import { useTranslations } from "next-intl";
import { Badge } from "@/components/ui/badge";
import type { SubmissionStatus, TrialStatus } from "@/lib/domain/vocabulary/enums";
import {
  INVITATION_LABELS,
  INVITATION_TONES,
  SEASON_STATE_LABELS,
  SEASON_STATE_TONES,
  STATUS_LABELS,
  STATUS_TONES,
  SUBMISSION_TONES,
  type InvitationState,
  type SeasonState,
} from "@/lib/domain/vocabulary/statuses";

/** A trial's status in its words and its one tone. */
export function TrialStatusBadge({ status }: { status: TrialStatus }) {
  return <Badge tone={STATUS_TONES[status]}>{STATUS_LABELS[status]}</Badge>;
}

/** A site's data status (being recorded, sent for review, returned, accepted) in its words and its one tone. */
export function SubmissionStatusBadge({ status }: { status: SubmissionStatus }) {
  const t = useTranslations("record");
  return <Badge tone={SUBMISSION_TONES[status]}>{t("status", { status })}</Badge>;
}

/** Whether a season takes new trials. */
export function SeasonStateBadge({ state }: { state: SeasonState }) {
  return <Badge tone={SEASON_STATE_TONES[state]}>{SEASON_STATE_LABELS[state]}</Badge>;
}

/** Where a person's invitation stands. */
export function InvitationBadge({ state }: { state: InvitationState }) {
  return <Badge tone={INVITATION_TONES[state]}>{INVITATION_LABELS[state]}</Badge>;
}
