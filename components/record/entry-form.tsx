"use client";

import { useCallback, useMemo, useState, useSyncExternalStore } from "react";
import { useLocale, useTranslations } from "next-intl";
import { translatorFor } from "@/lib/domain/i18n/catalogue";
import { cn } from "@/components/ui/cn";
import { describeRange, type EntryColumn } from "@/lib/domain/observations/columns";
import { parseCell, type CellValue } from "@/lib/domain/observations/values";
import { datesToCheck } from "@/lib/domain/observations/date-order";
import { Button } from "@/components/ui/button";
import { knownFromToken, restoredInputs, restoredReasons, slotOf, tokenOf, type Queue } from "./save-queue";
import { useSaveQueue } from "./use-save-queue";
import { plotPlace } from "@/lib/domain/design/site-layout";
import { Dialog } from "@/components/ui/dialog";
import { useScrollClearance } from "@/components/ui/use-scroll-clearance";
import { missingReasonLabels, isMissingReason, type MissingReason } from "@/lib/domain/observations/missing";

export interface EntryPlot {
  id: number;
  plotCode: string;
  block: number;
  position: number;
  blindCode: string;
  tray: number | null;
  traySlot: number | null;
}

const onlineSubscribe = (notify: () => void) => {
  window.addEventListener("online", notify);
  window.addEventListener("offline", notify);
  return () => {
    window.removeEventListener("online", notify);
    window.removeEventListener("offline", notify);
  };
};

/** How a value (or a reason) reads in a sentence: "4", "no value (plant died)". */
function shownValue(value: string, reason: MissingReason | null | undefined, reasonLabels: Record<MissingReason, string>, emptyValue: string): string {
  if (reason) return `${emptyValue} (${reasonLabels[reason].toLowerCase()})`;
  return value === "" ? emptyValue : value;
}

/**
 * Plot-by-plot entry in layout order. Every value is kept on the phone first and saved on its own as soon
 * as the grower leaves the field; without a signal it waits on the phone (through reloads, a closed tab
 * and a restart) and goes when the signal is back, so a dropped signal in the greenhouse never loses a count.
 * Each field says what Seedplot holds and what waits on the phone.
 */
export function EntryForm(props: {
  /** The person signed in: what waits on the phone is kept per person. */
  userId: number;
  trialId: number;
  siteId: number;
  columns: EntryColumn[];
  plots: EntryPlot[];
  initial: Record<string, string>;
  /** Why a slot has no value, by `plotId:key`. */
  initialReasons: Record<string, MissingReason>;
  defaultColumn: string;
  sownOn: string | null;
  transplantedOn: string | null;
  /** Saved dates far from the packet's days to maturity, by `plotId:key` (worked out on the server). */
  packetChecks: Record<string, string[]>;
  today: string;
  locked: string | null;
  comments: Record<number, string[]>;
  plotUnit: "insert" | "cells" | "bed_row";
  plotSize: number;
}) {
  const { trialId, siteId, columns, plots } = props;
  const t = useTranslations("entry");
  const tOffline = useTranslations("offline");
  const words = translatorFor(useLocale());
  const reasonLabels = useMemo(() => missingReasonLabels(words), [words]);
  const reasonOptions = Object.entries(reasonLabels) as [MissingReason, string][];
  const [choice, setChoice] = useState(props.defaultColumn);
  const [inputs, setInputs] = useState<Record<string, string>>(props.initial);
  const [reasons, setReasons] = useState<Record<string, MissingReason>>(props.initialReasons);
  const [askWhy, setAskWhy] = useState<Record<string, boolean>>({});
  const onRestore = useCallback((stored: Queue) => {
    setInputs((i) => restoredInputs(i, stored));
    setReasons((r) => restoredReasons(r, stored));
  }, []);
  const { queue, queuedCount: queued, conflictCount, savedTokens, status, errors, warnings: savedWarnings, notice, enqueue, choose, retryAll, differs, setSlotError } = useSaveQueue({
    userId: props.userId,
    trialId,
    siteId,
    initial: props.initial,
    initialReasons: props.initialReasons,
    onRestore,
  });
  const online = useSyncExternalStore(onlineSubscribe, () => navigator.onLine, () => true);

  function settle(slot: string, keep: "theirs" | "mine") {
    const item = queue[slot];
    if (!item?.conflict) return;
    if (keep === "theirs") {
      const { saved, savedReason } = item.conflict;
      setInputs((i) => ({ ...i, [slot]: savedReason ? "" : saved }));
      setReasons((r) => {
        const { [slot]: _old, ...rest } = r;
        return savedReason ? { ...rest, [slot]: savedReason } : rest;
      });
    }
    choose(slot, keep);
  }

  const ctx = useMemo(() => ({ sownOn: props.sownOn, transplantedOn: props.transplantedOn, today: props.today, t: words }), [props.sownOn, props.transplantedOn, props.today, words]);

  // Dates out of order, from what is in the fields now (typed, not only saved), under every date involved.
  // The packet's days to maturity stay on the server (growers record blind); its warnings come with a save.
  const dateChecks = useMemo(() => {
    const dateColumns = columns.filter((c) => c.valueType === "date");
    const out: Record<string, string[]> = {};
    if (dateColumns.length < 1) return out;
    for (const p of plots) {
      const value = (key: string): CellValue | null => {
        const c = dateColumns.find((d) => d.key === key);
        const parsed = c ? parseCell(c, inputs[slotOf(p.id, key)] ?? "", ctx) : null;
        return parsed?.ok ? parsed.value : null;
      };
      for (const w of datesToCheck({ columns: dateColumns, value, site: ctx, packetDays: null, audience: "grower", t: words })) {
        for (const key of w.keys) (out[slotOf(p.id, key)] ??= []).push(w.message);
      }
    }
    return out;
  }, [columns, plots, inputs, ctx]);

  const shown = useMemo(() => (choice === "all" ? columns : columns.filter((c) => c.key === choice)), [choice, columns]);

  function commit(plotId: number, column: EntryColumn, value: string) {
    const slot = slotOf(plotId, column.key);
    // Leaving an empty field keeps a reason already chosen; typing a value replaces it.
    if (value === "" && reasons[slot]) return;
    // Check first, so a value typed back to what was saved still clears the message of a wrong one before it.
    const parsed = parseCell(column, value, ctx);
    if (!parsed.ok) {
      setSlotError(slot, parsed.message);
      return;
    }
    setSlotError(slot, null);
    if (!differs(slot, value)) return;
    setReasons((r) => {
      const { [slot]: _replaced, ...rest } = r;
      return rest;
    });
    enqueue({ plotId, key: column.key, value, reason: null });
  }

  function chooseReason(plotId: number, column: EntryColumn, choice: string) {
    const slot = slotOf(plotId, column.key);
    const reason = isMissingReason(choice) ? choice : null;
    setReasons((r) => {
      const { [slot]: _old, ...rest } = r;
      return reason ? { ...rest, [slot]: reason } : rest;
    });
    // A reason replaces the value; choosing no reason leaves the field empty for a value.
    setInputs((i) => ({ ...i, [slot]: "" }));
    setSlotError(slot, null);
    if (!differs(slot, tokenOf("", reason))) return;
    enqueue({ plotId, key: column.key, value: "", reason });
  }

  // Fill one value down a column (seeds sown is the same in every plot): only plots with neither a value
  // nor a reason, after the grower confirms the number of plots it will write.
  const [filling, setFilling] = useState(false);
  const [fillValue, setFillValue] = useState("");
  const [fillError, setFillError] = useState<string | null>(null);
  const fillColumn = choice !== "all" && !props.locked ? columns.find((c) => c.key === choice && c.valueType !== "text") : undefined;
  const emptyPlots = fillColumn ? plots.filter((p) => !(inputs[slotOf(p.id, fillColumn.key)] ?? "") && !reasons[slotOf(p.id, fillColumn.key)]) : [];
  function fillDown() {
    if (!fillColumn) return;
    const parsed = parseCell(fillColumn, fillValue, ctx);
    if (fillValue.trim() === "" || !parsed.ok) {
      setFillError(parsed.ok ? t("typeValue") : parsed.message);
      return;
    }
    setInputs((i) => ({ ...i, ...Object.fromEntries(emptyPlots.map((p) => [slotOf(p.id, fillColumn.key), fillValue])) }));
    for (const p of emptyPlots) enqueue({ plotId: p.id, key: fillColumn.key, value: fillValue, reason: null });
    setFilling(false);
    setFillValue("");
    setFillError(null);
  }

  function focusNext(current: HTMLElement) {
    const all = Array.from(document.querySelectorAll<HTMLElement>("[data-entry-input]"));
    const i = all.indexOf(current);
    all[i + 1]?.focus();
  }

  const visiblePlots = plots;
  const stickyBar = useScrollClearance<HTMLDivElement>();

  return (
    <div className="space-y-4">
      <div ref={stickyBar} className="sticky top-0 z-10 -mx-4 space-y-3 border-b border-husk-200 bg-husk-50 px-4 py-3">
        <div>
          <label htmlFor="entry-column" className="block text-sm font-semibold text-loam-900">
            {t("whatRecording")}
          </label>
          <select id="entry-column" value={choice} onChange={(e) => setChoice(e.target.value)} className="mt-1 block min-h-12 w-full rounded-lg border border-loam-300 bg-white px-3 text-base">
            {columns.map((c) => (
              <option key={c.key} value={c.key}>
                {c.name}
                {c.unit ? ` (${c.unit})` : ""}
              </option>
            ))}
            <option value="all">{t("allValues")}</option>
          </select>
          {choice !== "all" && shown[0] && <p className="mt-1 text-sm text-loam-700">{t("valid", { range: describeRange(shown[0], words) })}</p>}
          {fillColumn && emptyPlots.length > 1 && (
            <Button type="button" variant="secondary" className="mt-2" onClick={() => setFilling(true)}>
              {t("sameValue", { count: String(emptyPlots.length) })}
            </Button>
          )}
          {filling && fillColumn && (
            <Dialog title={t("fillTitle", { column: fillColumn.name })} onClose={() => setFilling(false)}>
              <p>{t("fillHelp", { count: String(emptyPlots.length), column: fillColumn.name.toLowerCase() })}</p>
              <label htmlFor="fill-value" className="block text-sm font-semibold">
                {t("fillValue", { range: describeRange(fillColumn, words) })}
              </label>
              <input
                id="fill-value"
                type={fillColumn.valueType === "date" ? "date" : "text"}
                inputMode={fillColumn.valueType === "count" || fillColumn.valueType === "rating" ? "numeric" : "decimal"}
                value={fillValue}
                onChange={(e) => setFillValue(e.target.value)}
                aria-describedby="fill-error"
                className="block min-h-12 w-full rounded-lg border border-loam-300 px-3 text-base"
              />
              <p id="fill-error" className="min-h-5 text-sm font-semibold text-beet-700">
                {fillError}
              </p>
              <Button type="button" onClick={fillDown}>
                {t("fill", { count: String(emptyPlots.length) })}
              </Button>
            </Dialog>
          )}
        </div>
        <div aria-live="polite" role="status" className="space-y-2 text-sm">
          {!online ? (
            <p className="rounded-lg border border-sky-600 bg-sky-100 px-3 py-2 font-semibold text-sky-800">{queued - conflictCount > 0 ? tOffline("noSignalWaiting", { count: queued - conflictCount }) : tOffline("noSignal")}</p>
          ) : queued - conflictCount > 0 ? (
            <div className="flex flex-wrap items-center gap-3 rounded-lg border border-marigold-400 bg-marigold-100 px-3 py-2 text-marigold-800">
              <span className="font-semibold">{tOffline("waitingOnPhone", { count: queued - conflictCount })}</span>
              <Button type="button" variant="secondary" onClick={() => void retryAll()}>
                {tOffline("retryNow")}
              </Button>
            </div>
          ) : (
            conflictCount === 0 && <span className="text-loam-700">{tOffline("allSaved")}</span>
          )}
          {conflictCount > 0 && <p className="rounded-lg border border-beet-600 bg-white px-3 py-2 font-semibold text-beet-700">{tOffline("conflictsWaiting", { count: conflictCount })}</p>}
          {notice && <p className="font-semibold text-beet-700">{notice}</p>}
        </div>
      </div>
      {props.locked && <p className="rounded-lg border border-sky-600 bg-sky-100 px-3 py-2 text-sky-800">{props.locked}</p>}
      <ol className="space-y-3">
        {visiblePlots.map((p) => (
          <li key={p.id} id={`plot-${p.id}`} className="rounded-xl border border-husk-200 bg-white p-3 shadow-sm">
            <div className="mb-2 flex flex-wrap items-baseline justify-between gap-2">
              <span className="font-mono text-lg font-bold text-loam-900">{p.plotCode}</span>
              <span className="text-sm text-loam-700">
                {t("blockCode", { block: String(p.block) })} <span className="font-semibold">{p.blindCode}</span>
                {` · ${plotPlace(props.plotUnit, p, props.plotSize, words)}`}
              </span>
            </div>
            {props.comments[p.id]?.map((c, i) => (
              <p key={i} className="mb-2 rounded-lg border border-marigold-400 bg-marigold-100 px-3 py-2 text-sm text-marigold-800">
                {t("coordinator", { comment: c })}
              </p>
            ))}
            <div className={cn("grid gap-3", choice === "all" && "sm:grid-cols-2")}>
              {shown.map((c) => {
                const slot = slotOf(p.id, c.key);
                const id = `v-${p.id}-${c.key.replace(/[^A-Za-z0-9]/g, "_")}`;
                const st = status[slot];
                const err = errors[slot];
                const reason = reasons[slot];
                const whyId = `${id}-why`;
                const waitingHere = queue[slot];
                const serverToken = knownFromToken(savedTokens[slot]);
                const onServer = serverToken.value === null && serverToken.missingReason === null ? tOffline("nothingSavedYet") : tOffline("savedOnSeedplot", { value: shownValue(serverToken.value ?? "", serverToken.missingReason, reasonLabels, tOffline("emptyValue")) });
                // Packet warnings belong to the value saved (the latest save's answer, else the page's); once the
                // field shows something else they are stale.
                const packet = slot in savedWarnings ? savedWarnings[slot]!.filter((w) => w.kind === "far_from_packet").map((w) => w.message) : (props.packetChecks[slot] ?? []);
                const toCheck = err ? [] : [...(dateChecks[slot] ?? []), ...(st !== "saving" && !differs(slot, inputs[slot] ?? "") ? packet : [])];
                const common = {
                  id,
                  "data-entry-input": "",
                  disabled: !!props.locked,
                  "aria-invalid": err ? true : undefined,
                  "aria-describedby": toCheck.length > 0 ? `${id}-state ${id}-check` : `${id}-state`,
                  className: cn("block min-h-12 w-full rounded-lg border px-3 text-lg", err ? "border-beet-600" : "border-loam-300", reason ? "bg-husk-100" : "bg-white"),
                };
                return (
                  <div key={c.key}>
                    <label htmlFor={id} className={cn("block text-sm font-semibold text-loam-900", choice !== "all" && "sr-only")}>
                      {choice !== "all" ? `${p.plotCode}: ` : ""}
                      {c.name}
                      {c.unit ? ` (${c.unit})` : ""}
                    </label>
                    {c.valueType === "yes_no" ? (
                      <select {...common} value={inputs[slot] ?? ""} onChange={(e) => { setInputs((i) => ({ ...i, [slot]: e.target.value })); commit(p.id, c, e.target.value); }}>
                        <option value="">—</option>
                        <option value="yes">{words("common.yes")}</option>
                        <option value="no">{words("common.no")}</option>
                      </select>
                    ) : (
                      <input
                        {...common}
                        type={c.valueType === "date" ? "date" : "text"}
                        inputMode={c.valueType === "count" || c.valueType === "rating" ? "numeric" : c.valueType === "number" ? "decimal" : undefined}
                        autoComplete="off"
                        enterKeyHint="next"
                        value={inputs[slot] ?? ""}
                        placeholder={reason ? t("noValue") : undefined}
                        onChange={(e) => {
                          const value = e.target.value;
                          setInputs((i) => ({ ...i, [slot]: value }));
                          // A message goes as soon as the value is valid, not only when the field is left.
                          if (err && parseCell(c, value, ctx).ok) setSlotError(slot, null);
                        }}
                        onBlur={(e) => commit(p.id, c, e.target.value)}
                        onKeyDown={(e) => {
                          if (e.key === "Enter") {
                            e.preventDefault();
                            commit(p.id, c, (e.target as HTMLInputElement).value);
                            focusNext(e.target as HTMLElement);
                          }
                        }}
                      />
                    )}
                    <div className="mt-1 flex items-start justify-between gap-2">
                      <p id={`${id}-state`} className={cn("min-h-5 text-sm", err ? "font-semibold text-beet-700" : "text-loam-700")}>
                        {err ??
                          (waitingHere && !waitingHere.conflict
                            ? `${st === "saving" ? t("saving") : tOffline("stateWaiting")} · ${onServer}`
                            : st === "saving"
                              ? t("saving")
                              : st === "saved"
                                ? t("savedState")
                                : choice === "all" && !reason
                                  ? describeRange(c, words)
                                  : "")}
                      </p>
                      {!reason && !askWhy[slot] && !props.locked && (
                        <button
                          type="button"
                          className="-my-3 min-h-11 shrink-0 rounded-lg px-2 text-sm font-semibold text-sky-800 underline underline-offset-2 hover:bg-sky-100"
                          onClick={() => {
                            setAskWhy((a) => ({ ...a, [slot]: true }));
                            requestAnimationFrame(() => document.getElementById(whyId)?.focus());
                          }}
                        >
                          {/* the spoken name starts with the visible words, so voice control finds it */}
                          {t("noValueQ")}
                          <span className="sr-only">
                            {" "}
                            {t("sayWhy", { plot: p.plotCode, column: c.name })}
                          </span>
                        </button>
                      )}
                    </div>
                    {waitingHere?.conflict && (
                      <div id={`${id}-conflict`} role="group" aria-label={`${p.plotCode}, ${c.name}: ${tOffline("conflictTitle")}`} className="mt-1 space-y-2 rounded-lg border border-beet-600 bg-white px-3 py-2 text-sm text-loam-900">
                        <p className="font-semibold text-beet-700">{tOffline("conflictTitle")}</p>
                        <p>{tOffline("conflictBoth", { theirs: shownValue(waitingHere.conflict.saved, waitingHere.conflict.savedReason, reasonLabels, tOffline("emptyValue")), yours: shownValue(waitingHere.value, waitingHere.reason, reasonLabels, tOffline("emptyValue")) })}</p>
                        <div className="flex flex-wrap gap-2">
                          <Button type="button" variant="secondary" onClick={() => settle(slot, "theirs")}>
                            {tOffline("keepTheirs", { theirs: shownValue(waitingHere.conflict.saved, waitingHere.conflict.savedReason, reasonLabels, tOffline("emptyValue")) })}
                          </Button>
                          <Button type="button" variant="secondary" onClick={() => settle(slot, "mine")}>
                            {tOffline("useMine", { yours: shownValue(waitingHere.value, waitingHere.reason, reasonLabels, tOffline("emptyValue")) })}
                          </Button>
                        </div>
                      </div>
                    )}
                    {toCheck.length > 0 && (
                      <div id={`${id}-check`} className="mt-1 space-y-1 rounded-lg border border-marigold-400 bg-marigold-100 px-3 py-2 text-sm text-marigold-800">
                        {toCheck.map((m) => (
                          <p key={m}>
                            <span className="font-semibold">{t("check")}</span>
                            {m}
                          </p>
                        ))}
                      </div>
                    )}
                    {(reason || askWhy[slot]) && (
                      <div className="mt-1">
                        <label htmlFor={whyId} className="block text-sm font-semibold text-loam-900">
                          <span className="sr-only">{p.plotCode}, {c.name}: </span>{t("noValueBecause")}
                        </label>
                        <select
                          id={whyId}
                          value={reason ?? ""}
                          disabled={!!props.locked}
                          onChange={(e) => chooseReason(p.id, c, e.target.value)}
                          className={cn("mt-1 block min-h-11 w-full rounded-lg border px-3 text-base", reason ? "border-marigold-400 bg-marigold-100 text-marigold-800" : "border-loam-300 bg-white")}
                        >
                          <option value="">{t("thereIsValue")}</option>
                          {reasonOptions.map(([r, label]) => (
                            <option key={r} value={r}>
                              {label}
                            </option>
                          ))}
                        </select>
                      </div>
                    )}
                  </div>
                );
              })}
            </div>
          </li>
        ))}
      </ol>
    </div>
  );
}
