import path from "node:path";
import { Font, StyleSheet, Text, View } from "@react-pdf/renderer";
import type { SiteSheetData } from "./sheet-data";
import { translatorFor } from "@/lib/domain/i18n/catalogue";

// Fonts ship with the app; nothing is fetched at render time.
let registered = false;
export function registerFonts() {
  if (registered) return;
  const dir = path.join(process.cwd(), "public", "fonts", "inter");
  Font.register({
    family: "Inter",
    fonts: [
      { src: path.join(dir, "inter-latin-400-normal.woff"), fontWeight: 400 },
      { src: path.join(dir, "inter-latin-600-normal.woff"), fontWeight: 600 },
      { src: path.join(dir, "inter-latin-700-normal.woff"), fontWeight: 700 },
    ],
  });
  // The Latin subset has no Greek letters (χ² of the germination test, α); react-pdf takes each glyph the
  // first family lacks from the next one in the page's fontFamily list.
  Font.register({
    family: "Inter Greek",
    fonts: [
      { src: path.join(dir, "inter-greek-400-normal.woff"), fontWeight: 400 },
      { src: path.join(dir, "inter-greek-600-normal.woff"), fontWeight: 600 },
      { src: path.join(dir, "inter-greek-700-normal.woff"), fontWeight: 700 },
    ],
  });
  // Codes such as "S01-2-03" must never be split across lines.
  Font.registerHyphenationCallback((word) => [word]);
  registered = true;
}

// Print colours: near-black ink and one green accent (loam-900 / sprout-700 of the app palette).
export const INK = "#1b2618";
export const ACCENT = "#1b5c2e";
export const RULE = "#9aab8f";
export const SHADE = "#f3f5f1";
/** The caution colour treated-seed marks print in (dark amber; legible in greyscale too). */
export const TREATED_INK = "#8a4b00";

export const base = StyleSheet.create({
  page: { fontFamily: ["Inter", "Inter Greek"], fontSize: 9, color: INK, padding: 28, paddingBottom: 40 },
  h1: { fontSize: 15, fontWeight: 700, marginBottom: 2 },
  h2: { fontSize: 11, fontWeight: 700, marginTop: 8, marginBottom: 4, color: ACCENT },
  muted: { color: "#4f6446" },
  footer: { position: "absolute", bottom: 16, left: 28, right: 28, fontSize: 7, color: "#4f6446", flexDirection: "row", justifyContent: "space-between" },
});

export function SheetHeader({ data, title }: { data: SiteSheetData; title: string }) {
  const t = translatorFor(data.locale);
  return (
    <View style={{ marginBottom: 6 }}>
      <Text style={base.h1}>{title}</Text>
      <Text>
        {data.trialTitle} ({data.trialCode}) · {data.crop} · {data.season}
      </Text>
      <Text style={base.muted}>
        {t("sheets.site", { site: data.siteName, region: data.region })} · {t("sheets.sown", { date: data.sownOn ?? t("sheets.notSown") })} ·{" "}
        {t("sheets.layoutSeed", { seed: data.randomSeed === null ? t("sheets.notRandomised") : String(data.randomSeed) })}
      </Text>
    </View>
  );
}

export function Footer({ data }: { data: SiteSheetData }) {
  const t = translatorFor(data.locale);
  return (
    <View style={base.footer} fixed>
      <Text>{t("sheets.printed", { trial: data.trialCode, site: data.siteName, date: data.generatedOn })}</Text>
      <Text render={({ pageNumber, totalPages }) => t("sheets.page", { page: String(pageNumber), total: String(totalPages) })} />
    </View>
  );
}

export function Cautions({ data }: { data: SiteSheetData }) {
  const t = translatorFor(data.locale);
  return (
    <View wrap={false} style={{ marginTop: 8, borderWidth: 1, borderColor: "#b5740d", backgroundColor: "#fdf0d5", padding: 6 }}>
      <Text style={{ fontWeight: 700, marginBottom: 2 }}>{t("sheets.safety")}</Text>
      {data.cautions.map((c) => (
        <Text key={c.title} style={{ marginBottom: 2 }}>
          <Text style={{ fontWeight: 600 }}>{c.title}: </Text>
          {c.text}
        </Text>
      ))}
    </View>
  );
}

export function Protocol({ data }: { data: SiteSheetData }) {
  const t = translatorFor(data.locale);
  const unit =
    data.plotUnit === "insert"
      ? t("sheets.unitInsert", { seeds: data.seedsPerCell })
      : data.plotUnit === "cells"
        ? t("sheets.unitCells", { cells: String(data.plotSize), seeds: data.seedsPerCell })
        : t("sheets.unitBed", { plants: String(data.plotSize) });
  return (
    <View wrap={false}>
      <Text style={base.h2}>{t("sheets.protocol")}</Text>
      <Text>
        {data.design === "rcbd" ? t("sheets.designRcbd", { blocks: String(data.blocks) }) : t("sheets.designCrd", { blocks: String(data.blocks) })}; {unit}.
      </Text>
      {data.protocol ? <Text style={{ marginTop: 2 }}>{data.protocol}</Text> : null}
    </View>
  );
}
