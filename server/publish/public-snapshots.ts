import "server-only";
import { getPublicReport } from "@/db/queries/public";
import { trialCodeSchema, versionParamSchema } from "@/lib/validation/publish";
import { AppError } from "@/lib/errors";
import type { PublicSnapshot } from "@/lib/domain/publish/public-shape";

/**
 * Resolves the snapshot a public download asks for (latest live version, or ?version=N). Anything
 * not published, withdrawn or malformed is a plain 404, so guessed codes reveal nothing.
 */
export async function requirePublishedSnapshot(code: string, request: Request): Promise<PublicSnapshot> {
  const notFound = new AppError("not_found", "There are no published results at this address.");
  if (!trialCodeSchema.safeParse(code).success) throw notFound;
  const raw = new URL(request.url).searchParams.get("version");
  const version = raw === null ? undefined : versionParamSchema.safeParse(raw);
  if (version && !version.success) throw notFound;
  const report = await getPublicReport(code, version?.data);
  if (!report || report.kind !== "published") throw notFound;
  return report.snapshot;
}

/** A download name such as "TV26-LET-results-v2.pdf". */
export const downloadName = (s: PublicSnapshot, suffix: string) => `${s.trial.code}-results-v${s.version}.${suffix}`;
