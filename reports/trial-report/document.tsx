import { missingPlotList } from "@/lib/domain/observations/missing";
import type { ReactNode } from "react";
import { inStatedOrder, leaderHeading, orderWords } from "@/lib/domain/analysis/ranking";
import { Document, Page, StyleSheet, Text, View } from "@react-pdf/renderer";
import type { PublicBlock, PublicSnapshot, PublicTraitResult } from "@/lib/domain/publish/public-shape";
import type { PublicMixed } from "@/lib/domain/publish/public-mixed";
import { cvWords, differenceUnit, differenceWithUnit, formatNumber, formatP, hasCv, inShownUnit, numberInUnit, unitHeading, valueWithUnit } from "@/lib/domain/analysis/format";
import { ANOVA_SOURCE_LABELS, formatDate } from "@/lib/domain/vocabulary/labels";
import { ACCENT, INK, RULE, SHADE, base } from "../shared/pdf";
import { MeansChart } from "./means-chart";
import { capitalise } from "@/lib/domain/vocabulary/words";

const SETUP: Record<string, string> = { indoor_lights: "indoors under lights", greenhouse: "greenhouse", high_tunnel: "high tunnel", field: "field" };
const DESIGN: Record<string, string> = { rcbd: "randomised complete blocks", crd: "completely randomised" };
const UNIT: Record<string, string> = { insert: "six-cell insert", cells: "group of cells", bed_row: "bed row" };

const s = StyleSheet.create({
  coverTitle: { fontSize: 24, fontWeight: 700, marginTop: 140, color: INK },
  coverSub: { fontSize: 12, marginTop: 8 },
  table: { borderTopWidth: 0.8, borderTopColor: INK, borderBottomWidth: 0.8, borderBottomColor: INK, marginVertical: 4 },
  headRow: { flexDirection: "row", borderBottomWidth: 0.5, borderBottomColor: INK, backgroundColor: SHADE },
  row: { flexDirection: "row", borderBottomWidth: 0.3, borderBottomColor: RULE },
  cell: { paddingVertical: 2, paddingHorizontal: 3, fontSize: 8 },
  th: { paddingVertical: 2, paddingHorizontal: 3, fontSize: 7.5, fontWeight: 700 },
  para: { marginBottom: 5 },
  bullet: { flexDirection: "row", marginBottom: 3 },
  note: { fontSize: 8, color: "#333333", marginBottom: 2 },
  tocRow: { flexDirection: "row", justifyContent: "space-between", borderBottomWidth: 0.3, borderBottomColor: RULE, paddingVertical: 3 },
});

export interface SectionPages {
  [id: string]: number;
}

interface Column<T> {
  label: string;
  width: number;
  align?: "left" | "right";
  value: (row: T) => string;
}

function Table<T>({ columns, rows }: { columns: Column<T>[]; rows: T[] }) {
  return (
    <View style={s.table}>
      <View style={s.headRow} fixed>
        {columns.map((c) => (
          <Text key={c.label} style={[s.th, { width: c.width, textAlign: c.align ?? "left" }]}>
            {c.label}
          </Text>
        ))}
      </View>
      {rows.map((row, i) => (
        <View key={i} style={s.row} wrap={false}>
          {columns.map((c) => (
            <Text key={c.label} style={[s.cell, { width: c.width, textAlign: c.align ?? "left" }]}>
              {c.value(row)}
            </Text>
          ))}
        </View>
      ))}
    </View>
  );
}

/** Records the page a section starts on while the document is paginated. */
function SectionStart({ id, title, pages }: { id: string; title: string; pages: SectionPages }) {
  return (
    <View minPresenceAhead={80}>
      <Text
        style={base.h2}
        render={({ pageNumber }) => {
          pages[id] = pageNumber;
          return title;
        }}
      />
    </View>
  );
}

type TraitShape = PublicTraitResult["trait"];
type MeanRow = PublicBlock["means"][number];

/** The mark beside a difference to the check that is larger than the LSD 0.05, explained under the table. */
const BEYOND_LSD = "*";

/** A difference with its sign, "+2.1" or "−0.4", and no sign when it rounds to zero. */
function signed(trait: TraitShape, x: number): string {
  const shown = numberInUnit(trait, Math.abs(x));
  return /[1-9]/.test(shown) ? `${x > 0 ? "+" : "−"}${shown}` : shown;
}

function MeansTable({ block, trait }: { block: PublicBlock; trait: TraitShape }) {
  const unit = unitHeading(trait);
  const ranked = trait.betterWhen !== "neither";
  const withCheck = block.means.some((m) => m.checkDifference !== null);
  const columns: Column<MeanRow>[] = [
    ...(ranked ? [{ label: "Rank", width: 28, align: "right" as const, value: (m: MeanRow) => (m.rank === null ? "" : String(m.rank)) }] : []),
    { label: "Variety", width: ranked ? 136 : 164, value: (m) => `${m.varietyName ?? m.blindCode}${m.isCheck ? " (check)" : ""}` },
    { label: "Code", width: 32, value: (m) => m.blindCode },
    { label: `Mean${unit ? ` (${unit})` : ""}`, width: 78, align: "right", value: (m) => numberInUnit(trait, m.lsMean ?? m.mean) },
    ...(withCheck
      ? [
          { label: "% of check", width: 50, align: "right" as const, value: (m: MeanRow) => formatNumber(m.percentOfCheck, 0) },
          {
            label: "vs check",
            width: 58,
            align: "right" as const,
            value: (m: MeanRow) => (m.isCheck || m.checkDifference === null ? "" : `${signed(trait, m.checkDifference)}${m.beyondLsd ? ` ${BEYOND_LSD}` : ""}`),
          },
        ]
      : []),
    { label: "SE", width: 40, align: "right", value: (m) => formatNumber(inShownUnit(trait, m.se)) },
    { label: "Plots", width: 32, align: "right", value: (m) => String(m.n) },
    { label: "Group", width: 40, value: (m) => m.letter ?? "" },
  ];
  const checkWords = !withCheck
    ? ""
    : ` “% of check” is each mean as a percentage of the check variety's (check = 100); “vs check” is its difference from the check${differenceUnit(trait) ? ` in ${differenceUnit(trait)}` : ""}${
        block.lsd === null ? " (no LSD 0.05 to judge it against)." : `, marked ${BEYOND_LSD} where it is larger than the LSD 0.05 (${differenceWithUnit(trait, block.lsd)}), a clear difference.`
      }`;
  return (
    <>
      <Table columns={columns} rows={inStatedOrder(block.means)} />
      <Text style={s.note}>
        Listed {orderWords(trait)}.{ranked ? "" : " No rank is given."}
        {checkWords}
      </Text>
    </>
  );
}

function AnovaTable({ block }: { block: PublicBlock }) {
  return (
    <Table
      columns={[
        { label: "Source", width: 120, value: (r) => ANOVA_SOURCE_LABELS[r.source] },
        { label: "df", width: 35, align: "right", value: (r) => String(r.df) },
        { label: "Sum of squares", width: 85, align: "right", value: (r) => formatNumber(r.ss, 2) },
        { label: "Mean square", width: 85, align: "right", value: (r) => formatNumber(r.ms, 2) },
        { label: "F", width: 50, align: "right", value: (r) => (r.f === null ? "" : formatNumber(r.f, 2)) },
        { label: "p", width: 55, align: "right", value: (r) => (r.p === null ? "" : formatP(r.p)) },
        { label: "Tested against", width: 90, value: (r) => (r.testedAgainst ? ANOVA_SOURCE_LABELS[r.testedAgainst] : "") },
      ]}
      rows={block.rows}
    />
  );
}


const MIXED_TERMS: Record<string, (env: string) => string> = {
  environment: (env) => `Between ${env}s`,
  "entry:environment": (env) => `Variety × ${env}`,
  "block:environment": (env) => `Blocks within a ${env}`,
  residual: () => "Plot to plot",
};

/** The REML mixed model published with the trait: variance components in words, then means with SE and groups. */
function MixedSection({ mixed, trait }: { mixed: PublicMixed; trait: TraitShape }) {
  const unit = unitHeading(trait);
  const ranked = trait.betterWhen !== "neither";
  const withCheck = mixed.means.some((m) => m.percentOfCheck !== null);
  type MixedMean = PublicMixed["means"][number];
  return (
    <View>
      <Text style={[base.h2, { fontSize: 9 }]} minPresenceAhead={80}>Mixed model (REML)</Text>
      {mixed.notes.map((n, i) => (
        <Text key={i} style={s.note}>
          • {n}
        </Text>
      ))}
      <Table
        columns={[
          { label: "Source", width: 110, value: (c) => MIXED_TERMS[c.term]?.(mixed.environmentWord) ?? c.term },
          { label: `Spread (SD${unit ? `, ${unit}` : ""})`, width: 80, align: "right", value: (c) => numberInUnit(trait, Math.sqrt(Math.max(c.variance, 0))) },
          { label: "% of variation", width: 60, align: "right", value: (c) => formatNumber(c.share, 0) },
          { label: "What it means", width: 265, value: (c) => c.words },
        ]}
        rows={mixed.components}
      />
      <Table
        columns={[
          ...(ranked ? [{ label: "Rank", width: 28, align: "right" as const, value: (m: MixedMean) => (m.rank === null ? "" : String(m.rank)) }] : []),
          { label: "Variety", width: ranked ? 150 : 178, value: (m) => `${m.varietyName ?? m.blindCode}${m.isCheck ? " (check)" : ""}` },
          { label: `Mean${unit ? ` (${unit})` : ""}`, width: 78, align: "right", value: (m) => numberInUnit(trait, m.mean) },
          ...(withCheck ? [{ label: "% of check", width: 50, align: "right" as const, value: (m: MixedMean) => formatNumber(m.percentOfCheck, 0) }] : []),
          { label: "SE", width: 45, align: "right", value: (m) => formatNumber(inShownUnit(trait, m.se)) },
          { label: "df", width: 35, align: "right", value: (m) => formatNumber(m.df, 1) },
          { label: "Group", width: 40, value: (m) => m.letter ?? "" },
        ]}
        rows={mixed.means}
      />
      <Text style={s.note}>
        Varieties F test: F = {formatNumber(mixed.entryTest.f, 2)} on {mixed.entryTest.numDf} and {formatNumber(mixed.entryTest.denDf, 1)} df ({mixed.dfMethod === "satterthwaite" ? "Satterthwaite" : "Kenward-Roger"}), {formatP(mixed.entryTest.p)}.
        Groups come from pairwise t tests at the 5% level and are given only when the F test is significant; varieties sharing a letter do not differ.
      </Text>
    </View>
  );
}

type StabilityRow = NonNullable<PublicTraitResult["combined"]>["stability"] extends infer S ? (S extends { rows: (infer R)[] } ? R : never) : never;

/** Each variety's response to the sites, when the coordinator chose it at publication. */
function StabilityTable({ result }: { result: PublicTraitResult }) {
  const stability = result.combined?.stability;
  if (!stability) {
    return <Text style={s.note}>Stability across sites: {result.combined ? "not worked out for this trait (it needs 3 or more analysed sites and a measured trait)." : "needs a combined analysis of 3 or more sites."}</Text>;
  }
  const trait = result.trait;
  return (
    <>
      <Text style={[base.h2, { fontSize: 9 }]}>Stability across {stability.sites} sites</Text>
      <Table<StabilityRow>
        columns={[
          { label: "Variety", width: 110, value: (r) => `${r.varietyName ?? r.blindCode}${r.isCheck ? " (check)" : ""}` },
          { label: `Mean${unitHeading(trait) ? ` (${unitHeading(trait)})` : ""}`, width: 58, align: "right", value: (r) => numberInUnit(trait, r.mean) },
          { label: "Slope ± SE", width: 60, align: "right", value: (r) => `${formatNumber(r.slope, 2)} ± ${formatNumber(r.slopeSe, 2)}` },
          { label: "Deviation MS", width: 56, align: "right", value: (r) => formatNumber(r.deviationMs) },
          { label: "Shukla", width: 46, align: "right", value: (r) => formatNumber(r.shuklaVariance) },
          { label: "Reading", width: 206, value: (r) => r.reading },
        ]}
        rows={stability.rows}
      />
      {stability.notes.map((n, i) => (
        <Text key={i} style={s.note}>
          • {n}
        </Text>
      ))}
    </>
  );
}

function TraitSection({ result, pages, id, withStability }: { result: PublicTraitResult; pages: SectionPages; id: string; withStability: boolean }) {
  const block = result.combined ?? result.perSite.find((p) => p.result)?.result ?? null;
  const trait = result.trait;
  const figures = block
    ? [
        `Grand mean ${valueWithUnit(trait, block.grandMean)}`,
        cvWords(block.cv),
        block.lsd === null ? "LSD 0.05 not shown (varieties did not differ significantly)" : `LSD 0.05 ${differenceWithUnit(trait, block.lsd)}`,
        `variety F test ${formatP(block.entryP)}`,
      ].filter(Boolean)
    : [];
  return (
    <>
      <SectionStart id={id} title={trait.analysedAs} pages={pages} />
      {!block ? (
        <Text style={s.para}>{result.combinedProblem ?? "No site had enough data for an analysis."}</Text>
      ) : (
        <>
          <Text style={s.para}>
            {result.combined ? `Combined analysis of ${result.combined.sites} sites (sites ${result.combined.siteModel}). ` : "One site analysed. "}
            {figures.join(", ")}.
          </Text>
          <MeansChart means={block.means} trait={trait} lsd={block.lsd} />
          <MeansTable block={block} trait={trait} />
          <Text style={s.note}>{capitalise(block.comparisonNote)} Varieties sharing a letter in “Group” are not significantly different at the 5% level.</Text>
          <Text style={[base.h2, { fontSize: 9 }]}>Analysis of variance</Text>
          <AnovaTable block={block} />
          {result.mixed && <MixedSection mixed={result.mixed} trait={trait} />}
          {withStability && result.combined && <StabilityTable result={result} />}
          {result.notes.map((n, i) => (
            <Text key={i} style={s.note}>
              • {n}
            </Text>
          ))}
          {result.warnings.map((w, i) => (
            <Text key={`w${i}`} style={s.note}>
              Caution: {w}
            </Text>
          ))}
        </>
      )}
    </>
  );
}

/** One or more printed pages. Each section gets its own, so no forced break can leave a page empty. */
function ReportPage({ footer, children }: { footer: ReactNode; children: ReactNode }) {
  return (
    <Page size="LETTER" style={base.page}>
      {footer}
      {children}
    </Page>
  );
}

/**
 * The whole published report. Section headings record their page in `pages` while the document is paginated;
 * the contents entries are render callbacks, which react-pdf resolves again once pagination is complete (as it
 * does for "Page N of M"), so they read the finished page numbers in the same pass.
 */
/**
 * "Left out of the analysis": the sites this version does not include, then, trait by trait, exactly the
 * plots and sites left out of that trait with the public reason. The staff's notes are never in a snapshot.
 */
function LeftOut({ snapshot }: { snapshot: PublicSnapshot }) {
  const byTrait = snapshot.results.filter((r) => r.result.exclusions.length > 0);
  const { coverage } = snapshot;
  if (byTrait.length === 0 && coverage.notIncluded.length === 0) return null;
  return (
    <>
      <Text style={[base.h2, { fontSize: 9 }]}>Left out of the analysis</Text>
      {coverage.notIncluded.length > 0 && (
        <Text style={s.note}>
          Results from {coverage.inResults} of {coverage.enrolled} sites. Not included: {coverage.notIncluded.map((x) => `${x.name} (${x.reason})`).join("; ")}.
        </Text>
      )}
      {byTrait.map((r) => (
        <Text key={r.trait} style={s.note}>
          • {r.result.trait.name}: {r.result.exclusions.map((e) => `${e.plotCode ? `plot ${e.plotCode} at ${e.siteName}` : `all plots at ${e.siteName}`}, reason: ${e.reason}`).join("; ")}.
        </Text>
      ))}
    </>
  );
}

export function TrialReport({ snapshot, pages }: { snapshot: PublicSnapshot; pages: SectionPages }) {
  const t = snapshot.trial;
  const germination = snapshot.results.find((r) => r.result.germination)?.result.germination ?? null;
  const sections = [
    { id: "summary", title: "Summary for growers" },
    { id: "methods", title: "Methods" },
    ...snapshot.results.map((r) => ({ id: `trait-${r.trait}`, title: r.result.trait.analysedAs })),
    ...(germination ? [{ id: "germination", title: "Germination" }] : []),
    { id: "sites", title: "Site-by-site results" },
    { id: "cautions", title: "Cautions and disclaimer" },
  ];
  const published = formatDate(snapshot.publishedAt);
  const footer = (
    <View style={base.footer} fixed>
      <Text>
        {t.code} · {t.title} · version {snapshot.version} · published {published}
      </Text>
      <Text render={({ pageNumber, totalPages }) => `Page ${pageNumber} of ${totalPages}`} />
    </View>
  );
  return (
    <Document title={`${t.title} (${t.code}) — results`} author={snapshot.program} subject="Variety trial results" creator="Seedplot">
      <Page size="LETTER" style={base.page}>
        <Text style={{ fontSize: 10, color: ACCENT, fontWeight: 600, marginTop: 40 }}>{snapshot.program}</Text>
        <Text style={s.coverTitle}>{t.title}</Text>
        <Text style={s.coverSub}>
          {t.crop} variety trial · {t.season} · trial {t.code}
        </Text>
        <Text style={s.coverSub}>
          {snapshot.sites.length} partner sites · {snapshot.entries.length} varieties · {t.blocks} blocks per site
        </Text>
        <Text style={[s.coverSub, { marginTop: 30 }]}>
          Published {published} · version {snapshot.version}
        </Text>
        {snapshot.changeNote && <Text style={[s.para, { marginTop: 6 }]}>What changed in this version: {snapshot.changeNote}</Text>}
        <Text style={[base.h2, { marginTop: 40 }]}>Contents</Text>
        {sections.map((sec) => (
          <View key={sec.id} style={s.tocRow}>
            <Text>{sec.title}</Text>
            <Text render={() => String(pages[sec.id] ?? "")} />
          </View>
        ))}
        {footer}
      </Page>
      <ReportPage footer={footer}>
        <SectionStart id="summary" title="Summary for growers" pages={pages} />
        {snapshot.summary.map((line, i) => (
          <View key={i} style={s.bullet}>
            <Text style={{ width: 10 }}>•</Text>
            <Text style={[s.para, { flex: 1 }]}>{line}</Text>
          </View>
        ))}
        <Text style={s.para}>
          How sure are we? Each variety was grown in {t.blocks} replicated, randomised blocks at every site. A difference is called
          clear only when the analysis of variance found the varieties different at the 5% level; varieties sharing a letter in the
          tables are not clearly different. Results come from these sites and this season; weather, soil and management elsewhere can
          change the ranking.
        </Text>
        <SectionStart id="methods" title="Methods" pages={pages} />
        <Text style={s.para}>
          Design: {DESIGN[t.design] ?? t.design}, {t.blocks} blocks per site, each plot a {UNIT[t.plotUnit] ?? t.plotUnit} of {t.plotSize}{" "}
          {t.plotUnit === "bed_row" ? "plants" : "cells"}. Varieties were coded blind for the growers until publication.
        </Text>
        {t.purpose && <Text style={s.para}>Purpose: {t.purpose}</Text>}
        {t.protocol && <Text style={s.para}>Protocol: {t.protocol}</Text>}
        <Text style={s.para}>
          Analysis: sites treated as {snapshot.settings.siteModel} ({snapshot.settings.siteModel === "random" ? "varieties tested against the variety × site interaction" : "varieties tested against the pooled plot error"}); mean separation by{" "}
          {snapshot.settings.separation === "lsd" ? "protected LSD (only after a significant F test)" : "Tukey's HSD"} at the 5% level. Only data accepted by the coordinator are included.
          Missing plots are handled by least squares (no values are filled in).
          {snapshot.settings.mixed
            ? " Each trait is also analysed with a REML mixed model (varieties fixed; sites, blocks within sites and variety × site random; Satterthwaite degrees of freedom), which weighs sites and missing plots by how much they vary."
            : ""}
        </Text>
        <Table
          columns={[
            { label: "Site", width: 150, value: (x) => x.name },
            { label: "Region", width: 90, value: (x) => x.region },
            { label: "Setup", width: 100, value: (x) => SETUP[x.growingSetup] ?? x.growingSetup },
            { label: "Soil / medium", width: 110, value: (x) => x.soil ?? "" },
            { label: "Sown", width: 60, value: (x) => (x.sownOn ? formatDate(x.sownOn) : "") },
          ]}
          rows={snapshot.sites}
        />
        <Table
          columns={[
            { label: "Code", width: 40, value: (e) => e.blindCode },
            { label: "Variety", width: 150, value: (e) => `${e.variety}${e.isCheck ? " (check)" : ""}` },
            { label: "Seed source", width: 130, value: (e) => e.seedSource ?? "" },
            { label: "Lot", width: 60, value: (e) => e.lotCode ?? "" },
            { label: "Label germ. %", width: 70, align: "right", value: (e) => (e.labelGermination === null ? "not stated" : String(e.labelGermination)) },
            { label: "Treated", width: 50, value: (e) => (e.treated ? "yes" : "no") },
          ]}
          rows={snapshot.entries}
        />
        <LeftOut snapshot={snapshot} />
        {snapshot.results.flatMap((r) => r.result.missing).length > 0 && (
          <Text style={s.note}>
            Missing plots:{" "}
            {missingPlotList(snapshot.results.flatMap((r) => r.result.missing))}.
          </Text>
        )}
      </ReportPage>
      {snapshot.results.map((r) => (
        <ReportPage key={r.trait} footer={footer}>
          <TraitSection result={r.result} pages={pages} id={`trait-${r.trait}`} withStability={snapshot.settings.stabilityInReport === true} />
        </ReportPage>
      ))}
      {germination && (
        <ReportPage footer={footer}>
          <SectionStart id="germination" title="Germination" pages={pages} />
          <Text style={s.para}>{germination.note}</Text>
          <Table
            columns={[
              { label: "Variety", width: 150, value: (g) => g.varietyName ?? g.blindCode },
              { label: "Sown", width: 50, align: "right", value: (g) => String(g.sown) },
              { label: "Emerged", width: 50, align: "right", value: (g) => String(g.emerged) },
              { label: "Emergence %", width: 70, align: "right", value: (g) => formatNumber(g.percent, 1) },
              { label: "95% interval", width: 100, align: "right", value: (g) => `${formatNumber(g.lower, 1)}–${formatNumber(g.upper, 1)}` },
            ]}
            rows={germination.byEntry}
          />
          {germination.labels.map((l) => (
            <Text key={l.blindCode} style={s.note}>
              • {l.varietyName ?? l.blindCode}: {l.note}
            </Text>
          ))}
        </ReportPage>
      )}
      <ReportPage footer={footer}>
        <SectionStart id="sites" title="Site-by-site results" pages={pages} />
        {snapshot.results.map((r) => (
          <SiteTable key={r.trait} result={r.result} />
        ))}
      </ReportPage>
      <ReportPage footer={footer}>
        <SectionStart id="cautions" title="Cautions and disclaimer" pages={pages} />
        <Text style={s.para}>
          These results describe the partner sites and the season named above. A variety that did well here may do differently
          on your farm; try a small planting before changing a whole crop. Mention of a variety or seed source is not an
          endorsement.
        </Text>
        {snapshot.entries.some((e) => e.treated) && (
          <Text style={s.para}>
            Some seed lots in this trial were treated. Treated seed is not for food or feed; read the seed tag, wear the gloves
            it calls for, keep it from children and animals, and dispose of leftovers as the label and local rules direct.
            Organic certification may not allow treated seed.
          </Text>
        )}
        <Text style={s.para}>
          Follow label directions for any seed treatment, sanitiser or pesticide, and local codes for electrical equipment such
          as heat mats and grow lights near water. This report gives no prescriptive chemical or electrical advice.
        </Text>
        <Text style={[s.para, { marginTop: 8 }]}>How to cite: {snapshot.citation}</Text>
      </ReportPage>
    </Document>
  );
}

/** One trait's per-site figures: mean, CV (none for yes/no), the variety test, LSD and who came first there. */
function SiteTable({ result }: { result: PublicTraitResult }) {
  const trait = result.trait;
  const unit = unitHeading(trait);
  type SiteRow = PublicTraitResult["perSite"][number];
  const columns: Column<SiteRow>[] = [
    { label: "Site", width: 140, value: (p) => p.siteName },
    { label: `Mean${unit ? ` (${unit})` : ""}`, width: 70, align: "right", value: (p) => (p.result ? numberInUnit(trait, p.result.grandMean) : "") },
    ...(hasCv(trait) ? [{ label: "CV %", width: 40, align: "right" as const, value: (p: SiteRow) => (p.result ? formatNumber(p.result.cv, 1) : "") }] : []),
    { label: "Variety p", width: 55, align: "right", value: (p) => (p.result ? formatP(p.result.entryP) : "") },
    { label: "LSD 0.05", width: 50, align: "right", value: (p) => (p.result?.lsd != null ? formatNumber(inShownUnit(trait, p.result.lsd)) : p.result ? "n.s." : "") },
    {
      label: leaderHeading(trait),
      width: 160,
      value: (p) => {
        if (!p.result) return p.problem ?? "";
        const top = inStatedOrder(p.result.means)[0];
        return top ? (top.varietyName ?? top.blindCode) : "";
      },
    },
  ];
  return (
    <View style={{ marginBottom: 6 }}>
      <Text style={{ fontWeight: 700, marginBottom: 2 }} minPresenceAhead={60}>
        {trait.analysedAs}
      </Text>
      <Table columns={columns} rows={result.perSite} />
    </View>
  );
}
