"use client";
import { useState } from "react";
import { useRouter } from "next/navigation";
import { useLocale, useTranslations } from "next-intl";
import { Button } from "@/components/ui/button";
import { SelectField, TextField } from "@/components/ui/field";
import { BODY_LIMITS, statedFileLimit } from "@/lib/domain/request-limits";
import { sizeInMb } from "@/lib/domain/i18n/files";

/** Attach a photo to a plot or the whole site visit. GPS is removed unless the grower ticks the box. */
export function PhotoForm({ trialId, siteId, plots, defaultPlot }: { trialId: number; siteId: number; plots: { id: number; plotCode: string }[]; defaultPlot?: number }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const t = useTranslations("photos");
  const files = useTranslations("files");
  const locale = useLocale();

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = new FormData(e.currentTarget);
    const file = form.get("file");
    if (!(file instanceof File) || file.size === 0) {
      setMessage({ ok: false, text: t("chooseFirst") });
      return;
    }
    if (file.size > BODY_LIMITS.photo.fileBytes) {
      setMessage({ ok: false, text: files("tooLarge", { kind: "photo", size: sizeInMb(file.size, locale), limit: statedFileLimit("photo") }) });
      return;
    }
    form.set("trialId", String(trialId));
    form.set("siteId", String(siteId));
    setBusy(true);
    setMessage(null);
    try {
      const res = await fetch("/api/photos", { method: "POST", body: form });
      const body = (await res.json().catch(() => ({}))) as { error?: string };
      if (res.ok) {
        setMessage({ ok: true, text: t("attached") });
        (e.target as HTMLFormElement).reset();
        router.refresh();
      } else setMessage({ ok: false, text: body.error ?? t("notAttached") });
    } catch {
      setMessage({ ok: false, text: t("noConnection") });
    } finally {
      setBusy(false);
    }
  }

  return (
    <form onSubmit={onSubmit} className="space-y-3" noValidate>
      <div className="space-y-1">
        <label htmlFor="photo-file" className="block text-sm font-semibold text-loam-900">
          {t("fileLabel", { limit: statedFileLimit("photo") })}
        </label>
        <input id="photo-file" name="file" type="file" accept="image/jpeg,image/png,image/webp" capture="environment" className="block min-h-11 w-full text-base" />
      </div>
      <div className="grid gap-3 sm:grid-cols-2">
        <SelectField label={t("plot")} name="plotId" defaultValue={defaultPlot ? String(defaultPlot) : ""}>
          <option value="">{t("wholeSite")}</option>
          {plots.map((p) => (
            <option key={p.id} value={p.id}>
              {p.plotCode}
            </option>
          ))}
        </SelectField>
        <TextField label={t("caption")} name="caption" maxLength={300} autoComplete="off" />
      </div>
      <label className="flex min-h-11 items-center gap-2 text-sm">
        <input type="checkbox" name="keepLocation" className="size-5" />
        {t("keepLocation")}
      </label>
      <div aria-live="polite" role="status">
        {message && <p className={message.ok ? "text-sprout-700" : "font-semibold text-beet-700"}>{message.text}</p>}
      </div>
      <Button type="submit" variant="secondary" disabled={busy}>
        {busy ? t("attaching") : t("attach")}
      </Button>
    </form>
  );
}
