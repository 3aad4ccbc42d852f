import { inStatedOrder, leaderHeading } from "@/lib/domain/analysis/ranking";
import { Document, Page, StyleSheet, Text, View } from "@react-pdf/renderer";
import type { PublicBlock, PublicSnapshot, PublicTraitResult } from "@/lib/domain/publish/public-shape";
import { formatNumber, formatP } from "@/lib/domain/analysis/format";
import { ACCENT, INK, RULE, SHADE, base } from "../shared/pdf";
import { MeansChart } from "./means-chart";

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

// The shipped Latin subset of Inter has no Greek letters.
function printable(text: string): string {
  return text.replace(/α/g, "alpha");
}

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

function MeansTable({ block, unit }: { block: PublicBlock; unit: string | null }) {
  return (
    <Table
      columns={[
        { label: "Rank", width: 30, align: "right", value: (m) => String(m.rank) },
        { label: "Variety", width: 150, value: (m) => `${m.varietyName ?? "—"}${m.isCheck ? " (check)" : ""}` },
        { label: "Code", width: 40, value: (m) => m.blindCode },
        { label: `Mean${unit ? ` (${unit})` : ""}`, width: 80, align: "right", value: (m) => formatNumber(m.lsMean ?? m.mean) },
        { label: "SE", width: 50, align: "right", value: (m) => formatNumber(m.se) },
        { label: "Plots", width: 40, align: "right", value: (m) => String(m.n) },
        { label: "Group", width: 50, value: (m) => m.letter ?? "" },
      ]}
      rows={inStatedOrder(block.means)}
    />
  );
}

const SOURCE_LABEL: Record<string, string> = {
  site: "Site",
  block: "Block",
  "block:site": "Block within site",
  entry: "Variety",
  "entry:site": "Variety × site",
  residual: "Residual (error)",
};

function AnovaTable({ block }: { block: PublicBlock }) {
  return (
    <Table
      columns={[
        { label: "Source", width: 120, value: (r) => SOURCE_LABEL[r.source] ?? r.source },
        { label: "df", width: 35, align: "right", value: (r) => String(r.df) },
        { label: "Sum of squares", width: 85, align: "right", value: (r) => formatNumber(r.ss, 2) },
        { label: "Mean square", width: 85, align: "right", value: (r) => formatNumber(r.ms, 2) },
        { label: "F", width: 50, align: "right", value: (r) => (r.f === null ? "" : formatNumber(r.f, 2)) },
        { label: "p", width: 55, align: "right", value: (r) => (r.p === null ? "" : formatP(r.p)) },
        { label: "Tested against", width: 90, value: (r) => (r.testedAgainst ? SOURCE_LABEL[r.testedAgainst] ?? r.testedAgainst : "") },
      ]}
      rows={block.rows}
    />
  );
}

function TraitSection({ result, pages, id }: { result: PublicTraitResult; pages: SectionPages; id: string }) {
  const block = result.combined ?? result.perSite.find((p) => p.result)?.result ?? null;
  const unit = result.trait.valueType === "date" || result.trait.computation !== "none" ? "days" : result.trait.unit;
  return (
    <View break>
      <SectionStart id={id} title={result.trait.analysedAs} pages={pages} />
      {!block ? (
        <Text style={s.para}>{result.combinedProblem ?? "No site had enough data for an analysis."}</Text>
      ) : (
        <>
          <Text style={s.para}>
            {result.combined ? `Combined analysis of ${result.combined.sites} sites (sites ${result.combined.siteModel}). ` : "One site analysed. "}
            Grand mean {formatNumber(block.grandMean)}
            {unit ? ` ${unit}` : ""}, CV {formatNumber(block.cv, 1)}%, LSD 0.05 {block.lsd === null ? "not shown (varieties did not differ significantly)" : formatNumber(block.lsd)}, variety F test {formatP(block.entryP)}.
          </Text>
          <MeansChart means={block.means} unit={unit} lsd={block.lsd} />
          <MeansTable block={block} unit={unit} />
          <Text style={s.note}>{block.comparisonNote} Varieties sharing a letter in “Group” are not significantly different at the 5% level.</Text>
          <Text style={[base.h2, { fontSize: 9 }]}>Analysis of variance</Text>
          <AnovaTable block={block} />
          {result.notes.map((n, i) => (
            <Text key={i} style={s.note}>
              • {printable(n)}
            </Text>
          ))}
          {result.warnings.map((w, i) => (
            <Text key={`w${i}`} style={s.note}>
              Caution: {printable(w)}
            </Text>
          ))}
        </>
      )}
    </View>
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
  const published = snapshot.publishedAt.slice(0, 10);
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
      <Page size="LETTER" style={base.page}>
        {footer}
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
        </Text>
        <Table
          columns={[
            { label: "Site", width: 150, value: (x) => x.name },
            { label: "Region", width: 90, value: (x) => x.region },
            { label: "Setup", width: 100, value: (x) => SETUP[x.growingSetup] ?? x.growingSetup },
            { label: "Soil / medium", width: 110, value: (x) => x.soil ?? "" },
            { label: "Sown", width: 60, value: (x) => x.sownOn ?? "" },
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
            {[...new Set(snapshot.results.flatMap((r) => r.result.missing.map((m) => `${m.plotCode} (${m.siteName}, ${m.reason})`)))].join("; ")}.
          </Text>
        )}
      </Page>
      <Page size="LETTER" style={base.page}>
        {footer}
        {snapshot.results.map((r, i) => (
          <TraitSection key={r.trait} result={r.result} pages={pages} id={`trait-${r.trait}`} />
        ))}
        {germination && (
          <View break>
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
          </View>
        )}
        <View break>
          <SectionStart id="sites" title="Site-by-site results" pages={pages} />
          {snapshot.results.map((r) => (
            <View key={r.trait} style={{ marginBottom: 6 }}>
              <Text style={{ fontWeight: 700, marginBottom: 2 }}>{r.result.trait.analysedAs}</Text>
              <Table
                columns={[
                  { label: "Site", width: 140, value: (p) => p.siteName },
                  { label: "Mean", width: 55, align: "right", value: (p) => (p.result ? formatNumber(p.result.grandMean) : "") },
                  { label: "CV %", width: 45, align: "right", value: (p) => (p.result ? formatNumber(p.result.cv, 1) : "") },
                  { label: "Variety p", width: 55, align: "right", value: (p) => (p.result ? formatP(p.result.entryP) : "") },
                  { label: "LSD 0.05", width: 55, align: "right", value: (p) => (p.result?.lsd != null ? formatNumber(p.result.lsd) : p.result ? "n.s." : "") },
                  {
                    label: leaderHeading(r.result.trait),
                    width: 150,
                    value: (p) => {
                      if (!p.result) return p.problem ?? "";
                      const top = inStatedOrder(p.result.means)[0];
                      return top ? top.varietyName ?? top.blindCode : "";
                    },
                  },
                ]}
                rows={r.result.perSite}
              />
            </View>
          ))}
        </View>
        <View break>
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
        </View>
      </Page>
    </Document>
  );
}
