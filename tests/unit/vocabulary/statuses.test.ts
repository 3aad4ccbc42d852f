import { describe, expect, it } from "vitest";
import fs from "node:fs";
import path from "node:path";
import { SUBMISSION_STATUSES, TRIAL_STATUSES } from "@/lib/domain/vocabulary/enums";
import { STATUS_LABELS, STATUS_TONES, SUBMISSION_LABELS, SUBMISSION_TONES } from "@/lib/domain/vocabulary/statuses";

const root = path.resolve(import.meta.dirname, "../../..");

function sources(dir: string): string[] {
  return fs.readdirSync(path.join(root, dir), { withFileTypes: true }).flatMap((e) => {
    const rel = path.join(dir, e.name);
    if (e.isDirectory()) return sources(rel);
    return /\.tsx?$/.test(e.name) ? [rel] : [];
  });
}

describe("the status vocabulary", () => {
  it("gives every trial and submission status a label and a tone", () => {
    for (const s of TRIAL_STATUSES) expect([s, STATUS_LABELS[s], STATUS_TONES[s]]).toEqual([s, expect.any(String), expect.any(String)]);
    for (const s of SUBMISSION_STATUSES) expect([s, SUBMISSION_LABELS[s], SUBMISSION_TONES[s]]).toEqual([s, expect.any(String), expect.any(String)]);
  });

  it("a submitted site has one tone on every page: no page or component keeps its own status tones or labels", () => {
    const owners = [...sources("components"), ...sources("app")].filter((file) => {
      const code = fs.readFileSync(path.join(root, file), "utf8");
      return /\b(const|let)\s+\w*(STATUS|SUBMISSION)\w*(TONES?|LABELS)\b|Record<(TrialStatus|SubmissionStatus|SubmissionState|TrialStage),/.test(code) || /submitted:\s*"(warn|info|good|bad|neutral)"/.test(code);
    });
    expect(owners).toEqual([]);
  });

  it("badges show a status in its words, never the raw status name", () => {
    const raw = [...sources("components"), ...sources("app")].filter((file) => /<Badge[^>]*>\{\w+\.status\}<\/Badge>/.test(fs.readFileSync(path.join(root, file), "utf8")));
    expect(raw).toEqual([]);
  });
});
