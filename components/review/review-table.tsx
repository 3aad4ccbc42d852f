import Link from "next/link";
import { cn } from "@/components/ui/cn";
import { displayValue } from "@/lib/domain/observations/values";
import { MISSING_REASON_LABELS, MISSING_REASON_WORDS } from "@/lib/domain/observations/missing";
import { formatDate } from "@/lib/domain/vocabulary/labels";
import { SubmissionStatusBadge } from "@/components/ui/status-badge";
import type { ReviewQueue, ReviewSheet } from "@/server/review/sheets";

type Queue = ReviewQueue;

export function ReviewQueue({ rows }: { rows: Queue }) {
  if (rows.length === 0) return <p className="text-loam-700">No sites are taking data in your trials.</p>;
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-left text-sm">
        <caption className="sr-only">Sites to review</caption>
        <thead className="border-b border-husk-200 text-loam-700">
          <tr>
            <th scope="col" className="py-2 pr-3">Site</th>
            <th scope="col" className="py-2 pr-3">Trial</th>
            <th scope="col" className="py-2 pr-3">State</th>
            <th scope="col" className="py-2 pr-3 text-right">Complete</th>
            <th scope="col" className="py-2 pr-3 text-right">Late counts</th>
            <th scope="col" className="py-2 text-right">Flagged</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={`${r.trialId}:${r.siteId}`} className="border-b border-husk-100">
              <td className="py-2 pr-3">
                <Link href={`/portal/review/${r.trialId}/${r.siteId}`} className="font-semibold">
                  {r.siteName}
                </Link>
              </td>
              <td className="py-2 pr-3 font-mono text-xs">{r.trialCode}</td>
              <td className="py-2 pr-3">
                <SubmissionStatusBadge status={r.status} />
                {r.leftOutOfPublished && <span className="mt-1 block text-xs font-semibold text-beet-700">Results published without this site</span>}
              </td>
              <td className="py-2 pr-3 text-right tabular-nums">
                {r.expected === 0 ? "—" : `${Math.round((100 * r.recorded) / r.expected)}%`} <span className="text-loam-700">({r.recorded}/{r.expected})</span>
              </td>
              <td className={cn("py-2 pr-3 text-right tabular-nums", r.late > 0 && "font-semibold text-beet-700")}>{r.late}</td>
              <td className={cn("py-2 text-right tabular-nums", r.flags > 0 && "font-semibold text-marigold-800")}>{r.flags}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

/** Every value of the site, plots in layout order; flagged values are marked and explained below. */
export function ReviewValues({ sheet }: { sheet: ReviewSheet }) {
  // A value can have more than one reason to check it (a harvest date before emergence and far from the packet).
  const flagged = new Map<string, { message: string }>();
  for (const f of sheet.flags) {
    const slot = `${f.plotId}:${f.key}`;
    flagged.set(slot, { message: flagged.has(slot) ? `${flagged.get(slot)!.message} ${f.message}` : f.message });
  }
  const commented = new Set(sheet.comments.map((c) => `${c.plotId}:${c.observationId}`));
  const base = `/portal/review/${sheet.enrolment.trialId}/${sheet.enrolment.siteId}`;
  return (
    <div className="space-y-4">
      <div className="overflow-x-auto">
        <table className="w-full text-left text-sm">
          <caption className="sr-only">Recorded values</caption>
          <thead className="border-b border-husk-200 text-loam-700">
            <tr>
              <th scope="col" className="sticky left-0 bg-white py-2 pr-3">Plot</th>
              <th scope="col" className="py-2 pr-3">Code</th>
              {sheet.columns.map((c) => (
                <th key={c.key} scope="col" className="py-2 pr-3 text-right align-bottom">
                  {c.name}
                  {c.unit && <span className="block font-normal">{c.unit}</span>}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {sheet.plots.map((p) => (
              <tr key={p.id} className="border-b border-husk-100">
                <th scope="row" className="sticky left-0 bg-white py-1 pr-3 font-mono">
                  {p.plotCode}
                </th>
                <td className="py-1 pr-3">{p.blindCode}</td>
                {sheet.columns.map((c) => {
                  const flag = flagged.get(`${p.id}:${c.key}`);
                  const obsId = sheet.observationIds[`${p.id}:${c.key}`];
                  const value = displayValue(c, sheet.values[p.id]?.[c.key] ?? null);
                  return (
                    <td key={c.key} className={cn("py-1 pr-3 text-right tabular-nums", c.valueType === "date" && "whitespace-nowrap", flag && "bg-marigold-100 font-semibold text-marigold-800", commented.has(`${p.id}:${obsId}`) && "underline decoration-sky-600 decoration-2")} title={flag?.message}>
                      {value ? (
                        <Link href={`${base}?plot=${p.id}&key=${encodeURIComponent(c.key)}#comment`} className="text-inherit no-underline" aria-label={`Comment on ${p.plotCode} ${c.name}: ${value}${flag ? ` (flagged: ${flag.message})` : ""}`}>
                          {value}
                        </Link>
                      ) : sheet.missing[p.id]?.[c.key] ? (
                        <span className="whitespace-nowrap text-sm italic text-loam-700" aria-label={`${p.plotCode} ${c.name}: no value, ${MISSING_REASON_LABELS[sheet.missing[p.id]![c.key]!]}`}>
                          none: {MISSING_REASON_WORDS[sheet.missing[p.id]![c.key]!]}
                        </span>
                      ) : (
                        <span className="text-loam-500">·</span>
                      )}
                    </td>
                  );
                })}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {sheet.flags.length > 0 && (
        <div>
          <h3 className="font-bold text-loam-900">Values to check ({sheet.flags.length})</h3>
          <ul className="list-disc pl-5 text-sm">
            {sheet.flags.map((f, i) => {
              const plot = sheet.plots.find((p) => p.id === f.plotId)!;
              const col = sheet.columns.find((c) => c.key === f.key)!;
              return (
                <li key={`${f.plotId}:${f.key}:${f.kind}:${i}`}>
                  <Link href={`${base}?plot=${f.plotId}&key=${encodeURIComponent(f.key)}#comment`}>
                    {plot.plotCode}, {col.name}
                  </Link>
                  : {f.message}
                </li>
              );
            })}
          </ul>
        </div>
      )}
    </div>
  );
}

export function CommentList({ sheet }: { sheet: ReviewSheet }) {
  if (sheet.allComments.length === 0) return <p className="text-sm text-loam-700">No comments yet.</p>;
  return (
    <ul className="space-y-2 text-sm">
      {sheet.allComments.map((c) => {
        const plot = sheet.plots.find((p) => p.id === c.plotId);
        return (
          <li key={c.id} className={cn("rounded-lg border px-3 py-2", c.resolvedAt ? "border-husk-200 text-loam-700" : "border-marigold-400 bg-marigold-100")}>
            <span className="font-semibold">{plot ? `Plot ${plot.plotCode}` : "Whole site"}</span>: {c.body}
            <span className="block text-xs text-loam-700">
              {c.author} · {formatDate(c.createdAt.toISOString())} · {c.resolvedAt ? "answered" : "open"}
            </span>
          </li>
        );
      })}
    </ul>
  );
}
