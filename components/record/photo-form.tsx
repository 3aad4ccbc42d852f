"use client";
import { useState } from "react";
import { useRouter } from "next/navigation";
import { Button } from "@/components/ui/button";
import { SelectField, TextField } from "@/components/ui/field";
import { BODY_LIMITS, fileTooLarge, statedFileLimit } from "@/lib/domain/request-limits";

/** Attach a photo to a plot or the whole site visit. GPS is removed unless the grower ticks the box. */
export function PhotoForm({ trialId, siteId, plots, defaultPlot }: { trialId: number; siteId: number; plots: { id: number; plotCode: string }[]; defaultPlot?: number }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = new FormData(e.currentTarget);
    const file = form.get("file");
    if (!(file instanceof File) || file.size === 0) {
      setMessage({ ok: false, text: "Choose a photo first." });
      return;
    }
    if (file.size > BODY_LIMITS.photo.fileBytes) {
      setMessage({ ok: false, text: fileTooLarge("photo", file.size) });
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
        setMessage({ ok: true, text: "Photo attached." });
        (e.target as HTMLFormElement).reset();
        router.refresh();
      } else setMessage({ ok: false, text: body.error ?? "The photo was not attached." });
    } catch {
      setMessage({ ok: false, text: "The photo did not get through. Check your connection and try again." });
    } finally {
      setBusy(false);
    }
  }

  return (
    <form onSubmit={onSubmit} className="space-y-3" noValidate>
      <div className="space-y-1">
        <label htmlFor="photo-file" className="block text-sm font-semibold text-loam-900">
          Photo (JPEG, PNG or WebP, up to {statedFileLimit("photo")})
        </label>
        <input id="photo-file" name="file" type="file" accept="image/jpeg,image/png,image/webp" capture="environment" className="block min-h-11 w-full text-base" />
      </div>
      <div className="grid gap-3 sm:grid-cols-2">
        <SelectField label="Plot" name="plotId" defaultValue={defaultPlot ? String(defaultPlot) : ""}>
          <option value="">Whole site visit</option>
          {plots.map((p) => (
            <option key={p.id} value={p.id}>
              {p.plotCode}
            </option>
          ))}
        </SelectField>
        <TextField label="Caption (optional)" name="caption" maxLength={300} autoComplete="off" />
      </div>
      <label className="flex min-h-11 items-center gap-2 text-sm">
        <input type="checkbox" name="keepLocation" className="size-5" />
        Keep the photo's GPS location (it is removed otherwise, to keep your farm's position private)
      </label>
      <div aria-live="polite" role="status">
        {message && <p className={message.ok ? "text-sprout-700" : "font-semibold text-beet-700"}>{message.text}</p>}
      </div>
      <Button type="submit" variant="secondary" disabled={busy}>
        {busy ? "Attaching…" : "Attach photo"}
      </Button>
    </form>
  );
}
