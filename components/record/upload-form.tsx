"use client";

import { useRef, useState } from "react";
import Link from "next/link";
import { useLocale, useTranslations } from "next-intl";
import { Button, buttonClasses } from "@/components/ui/button";
import { Badge } from "@/components/ui/badge";
import { BODY_LIMITS, statedFileLimit } from "@/lib/domain/request-limits";
import { sizeInMb } from "@/lib/domain/i18n/files";

interface Problem {
  row: number | null;
  column: string | null;
  message: string;
}
interface Preview {
  ok: boolean;
  refused: string | null;
  /** The worksheet that was read and the ones that were not (workbooks only). */
  sheet?: string | null;
  otherSheets?: string[];
  rows?: number;
  blankRows?: number[];
  counts?: { new: number; changed: number; unchanged: number };
  problems: Problem[];
  /** Values that save but are worth a second look (dates out of order, far from the packet). */
  warnings?: Problem[];
  changes?: { row: number | null; plotCode: string; column: string; kind: "new" | "changed"; oldValue: string; newValue: string }[];
}

/** Sends the file with XMLHttpRequest, because fetch cannot report upload progress. */
function post(endpoint: string, file: File, mode: "preview" | "commit", onProgress: (pct: number) => void): Promise<{ status: number; body: unknown }> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open("POST", endpoint);
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress(Math.round((e.loaded / e.total) * 100));
    };
    xhr.onload = () => {
      let body: unknown = null;
      try {
        body = JSON.parse(xhr.responseText);
      } catch {
        body = null;
      }
      resolve({ status: xhr.status, body });
    };
    xhr.onerror = () => reject(new Error("network"));
    const form = new FormData();
    form.set("file", file);
    form.set("mode", mode);
    xhr.send(form);
  });
}

export function UploadForm({ endpoint, backHref }: { endpoint: string; backHref: string }) {
  const input = useRef<HTMLInputElement>(null);
  const [file, setFile] = useState<File | null>(null);
  const [progress, setProgress] = useState<number | null>(null);
  const [phase, setPhase] = useState<"idle" | "uploading" | "checking" | "saving" | "done">("idle");
  const [preview, setPreview] = useState<Preview | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [saved, setSaved] = useState<number | null>(null);
  const t = useTranslations("upload");
  const files = useTranslations("files");
  const locale = useLocale();

  async function run(mode: "preview" | "commit") {
    if (!file) return;
    setError(null);
    if (file.size > BODY_LIMITS.spreadsheet.fileBytes) {
      setError(files("tooLarge", { kind: "spreadsheet", size: sizeInMb(file.size, locale), limit: statedFileLimit("spreadsheet") }));
      return;
    }
    setProgress(0);
    setPhase("uploading");
    try {
      const res = await post(endpoint, file, mode, (pct) => {
        setProgress(pct);
        if (pct >= 100) setPhase(mode === "preview" ? "checking" : "saving");
      });
      const body = res.body as (Preview & { error?: string; saved?: number; preview?: Preview }) | null;
      if (!body) setError(t("noAnswer"));
      else if (mode === "preview") {
        if (res.status >= 400) setError(body.error ?? t("couldNotCheck"));
        else setPreview(body);
      } else if (res.status === 200) {
        setSaved(body.saved ?? 0);
        setPreview(null);
      } else {
        setError(body.error ?? t("hasProblems"));
        if (body.preview) setPreview(body.preview);
      }
    } catch {
      setError(t("noConnection"));
    } finally {
      setPhase("done");
      setProgress(null);
    }
  }

  const busy = phase === "uploading" || phase === "checking" || phase === "saving";
  return (
    <div className="space-y-4">
      <div className="space-y-2 rounded-xl border border-husk-200 bg-white p-4">
        <label htmlFor="upload-file" className="block font-semibold text-loam-900">
          {t("fileLabel", { limit: statedFileLimit("spreadsheet") })}
        </label>
        <input
          ref={input}
          id="upload-file"
          type="file"
          accept=".xlsx,.csv,application/vnd.openxmlformats-officedocument.spreadsheetml.sheet,text/csv"
          className="block min-h-11 w-full text-base"
          onChange={(e) => {
            setFile(e.target.files?.[0] ?? null);
            setPreview(null);
            setSaved(null);
            setError(null);
          }}
        />
        <Button type="button" onClick={() => run("preview")} disabled={!file || busy}>
          {t("check")}
        </Button>
        <div aria-live="polite" role="status" className="text-sm">
          {progress !== null && phase === "uploading" && (
            <div className="space-y-1">
              <progress max={100} value={progress} className="h-3 w-full" aria-label={t("progress")} />
              <span>{t("uploading", { pct: String(progress) })}</span>
            </div>
          )}
          {phase === "checking" && <span>{t("checking")}</span>}
          {phase === "saving" && <span>{t("saving")}</span>}
        </div>
      </div>

      {error && <p className="rounded-lg border border-beet-600 bg-beet-50 px-3 py-2 font-medium text-beet-700">{error}</p>}
      {saved !== null && (
        <div className="rounded-lg border border-sprout-500 bg-sprout-50 px-3 py-2 text-sprout-700">
          <p className="font-semibold">{t("saved", { count: saved })}</p>
          <Link href={backHref} className={buttonClasses("secondary", "mt-2")}>
            {t("backToPlots")}
          </Link>
        </div>
      )}
      {preview && <PreviewPanel preview={preview} busy={busy} onCommit={() => run("commit")} />}
    </div>
  );
}

type Words = ReturnType<typeof useTranslations<"upload">>;

/** Where a problem is, as the grower finds it in their spreadsheet: "Row 5, column E (Quality [1-9])". */
const where = (t: Words, p: Problem) => {
  const place = p.row ? t("row", { row: String(p.row) }) : t("file");
  return p.column ? t("where", { place, column: p.column }) : place;
};

function WarningList({ warnings }: { warnings: Problem[] }) {
  const t = useTranslations("upload");
  return (
    <div className="space-y-2 rounded-lg border border-marigold-400 bg-marigold-100 px-3 py-2 text-marigold-800">
      <p>
        <span className="font-semibold">{t("secondLook", { count: String(warnings.length) })}</span> {t("secondLookHelp")}
      </p>
      <ul className="list-disc space-y-1 pl-5">
        {warnings.slice(0, 200).map((w, i) => (
          <li key={i}>
            {where(t, w)}: {w.message}
          </li>
        ))}
      </ul>
    </div>
  );
}

function PreviewPanel({ preview, busy, onCommit }: { preview: Preview; busy: boolean; onCommit: () => void }) {
  const t = useTranslations("upload");
  if (preview.refused) {
    return (
      <div className="rounded-xl border border-beet-600 bg-beet-50 p-4 text-beet-700" role="alert">
        <p className="font-bold">{t("cannotUse")}</p>
        <p>{preview.refused}</p>
      </div>
    );
  }
  const c = preview.counts!;
  return (
    <section className="space-y-3 rounded-xl border border-husk-200 bg-white p-4" aria-label={t("wouldChange")}>
      <h3 className="text-lg font-bold text-loam-900">{t("wouldChange")}</h3>
      {preview.sheet && (
        <p className="text-loam-700">
          {t("readFrom", { sheet: preview.sheet })}
          {preview.otherSheets && preview.otherSheets.length > 0 && t("notRead", { sheets: preview.otherSheets.map((n) => `“${n}”`).join(", ") })}
        </p>
      )}
      <p className="flex flex-wrap gap-2">
        <Badge tone="good">{t("new", { count: c.new })}</Badge>
        <Badge tone="warn">{t("changed", { count: c.changed })}</Badge>
        <Badge>{t("unchanged", { count: c.unchanged })}</Badge>
        {preview.blankRows && preview.blankRows.length > 0 && <Badge>{t("emptyRows", { count: String(preview.blankRows.length) })}</Badge>}
      </p>
      {preview.warnings && preview.warnings.length > 0 && <WarningList warnings={preview.warnings} />}
      {preview.problems.length > 0 ? (
        <div role="alert" className="space-y-2">
          <p className="font-semibold text-beet-700">
            {t("problems", { count: preview.problems.length })}
          </p>
          <ul className="list-disc space-y-1 pl-5 text-beet-700">
            {preview.problems.slice(0, 200).map((p, i) => (
              <li key={i}>
                {where(t, p)}: {p.message}
              </li>
            ))}
          </ul>
        </div>
      ) : (
        <>
          {preview.changes && preview.changes.length > 0 && (
            <div className="max-h-96 overflow-auto">
              <table className="w-full text-left text-sm">
                <caption className="sr-only">{t("valuesToSave")}</caption>
                <thead className="border-b border-husk-200 text-loam-700">
                  <tr>
                    <th scope="col" className="py-1 pr-2">{t("colRow")}</th>
                    <th scope="col" className="py-1 pr-2">{t("colPlot")}</th>
                    <th scope="col" className="py-1 pr-2">{t("colColumn")}</th>
                    <th scope="col" className="py-1 pr-2">{t("colNow")}</th>
                    <th scope="col" className="py-1">{t("colNew")}</th>
                  </tr>
                </thead>
                <tbody>
                  {preview.changes.map((ch, i) => (
                    <tr key={i} className="border-b border-husk-100">
                      <td className="py-1 pr-2 tabular-nums">{ch.row}</td>
                      <td className="py-1 pr-2 font-mono">{ch.plotCode}</td>
                      <td className="py-1 pr-2">{ch.column}</td>
                      <td className="py-1 pr-2">{ch.oldValue || "—"}</td>
                      <td className="py-1 font-semibold">{ch.newValue}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
          {c.new + c.changed === 0 && <p className="text-loam-700">{t("nothingNew")}</p>}
          <Button type="button" onClick={onCommit} disabled={busy || c.new + c.changed === 0}>
            {c.new + c.changed === 0 ? t("nothingToSave") : t("saveValues", { count: String(c.new + c.changed) })}
          </Button>
        </>
      )}
    </section>
  );
}
