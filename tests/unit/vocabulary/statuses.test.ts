import { describe, expect, it } from "vitest";
import fs from "node:fs";
import path from "node:path";
import { projectRoot, sourceFiles } from "../../helpers/source-files";
import { SUBMISSION_STATUSES, TRIAL_STATUSES } from "@/lib/domain/vocabulary/enums";
import { STATUS_LABELS, STATUS_TONES, SUBMISSION_LABELS, SUBMISSION_TONES } from "@/lib/domain/vocabulary/statuses";

describe("the status vocabulary", () => {
  it("gives every trial and submission status a label and a tone", () => {
    for (const s of TRIAL_STATUSES) expect([s, STATUS_LABELS[s], STATUS_TONES[s]]).toEqual([s, expect.any(String), expect.any(String)]);
    for (const s of SUBMISSION_STATUSES) expect([s, SUBMISSION_LABELS[s], SUBMISSION_TONES[s]]).toEqual([s, expect.any(String), expect.any(String)]);
  });

  it("a submitted site has one tone on every page: no page or component keeps its own status tones or labels", () => {
    const owners = [...sourceFiles("components"), ...sourceFiles("app")].filter((file) => {
      const code = fs.readFileSync(path.join(projectRoot, file), "utf8");
      return /\b(const|let)\s+\w*(STATUS|SUBMISSION)\w*(TONES?|LABELS)\b|Record<(TrialStatus|SubmissionStatus|SubmissionState|TrialStage),/.test(code) || /submitted:\s*"(warn|info|good|bad|neutral)"/.test(code);
    });
    expect(owners).toEqual([]);
  });

  it("badges show a status in its words, never the raw status name", () => {
    const raw = [...sourceFiles("components"), ...sourceFiles("app")].filter((file) => /<Badge[^>]*>\{\w+\.status\}<\/Badge>/.test(fs.readFileSync(path.join(projectRoot, file), "utf8")));
    expect(raw).toEqual([]);
  });
});
