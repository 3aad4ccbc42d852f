import { describe, expect, it } from "vitest";
import en from "@/messages/en.json";
import es from "@/messages/es.json";
import { LOCALES } from "@/lib/domain/vocabulary/enums";
import { CATALOGUES, translatorFor } from "@/lib/domain/i18n/catalogue";
import { catalogueProblems } from "@/tests/helpers/catalogue-check";

describe("message catalogue", () => {
  it("every message has a Spanish translation with every placeholder of the English original", () => {
    expect(catalogueProblems(en, es)).toEqual([]);
  });

  it("every language Seedplot offers has a catalogue that passes the same check", () => {
    for (const locale of LOCALES) expect(catalogueProblems(en, CATALOGUES[locale]), locale).toEqual([]);
  });

  it("the check fails on a missing translation and on a dropped placeholder", () => {
    const broken = structuredClone(es) as Record<string, Record<string, unknown>>;
    delete broken.upload!.row;
    broken.upload!.uploading = "Subiendo…";
    broken.home!.siteLine = "{site} · sembrado el {date} · {plots, plural, one {# parcela} other {parcelas}}";
    broken.values!.notYesNo = "No es sí ni no.";
    expect(catalogueProblems(en, broken as typeof es).sort()).toEqual([
      "upload.row: no translation",
      "upload.uploading: the translation lacks the placeholder {pct}",
      "values.notYesNo: the translation lacks the placeholder {raw}",
    ]);
    broken.home!.siteLine = "{site} · sembrado el {date}";
    expect(catalogueProblems(en, broken as typeof es)).toContain("home.siteLine: the translation lacks the placeholder {plots}");
  });

  it("a translation that is not valid ICU is reported, not passed", () => {
    const broken = structuredClone(es) as Record<string, Record<string, unknown>>;
    broken.upload!.row = "Fila {row";
    expect(catalogueProblems(en, broken as typeof es)[0]).toMatch(/^upload\.row: not a valid ICU message/);
  });

  it("every message formats in every language with example values", () => {
    for (const locale of LOCALES) {
      const t = translatorFor(locale);
      expect(t("upload.row", { row: "7" })).toBe(locale === "en" ? "Row 7" : "Fila 7");
      expect(t("offline.waitingOnPhone", { count: 2 })).toContain("2");
    }
  });
});
