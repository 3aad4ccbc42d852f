import type { BetterWhen } from "@/lib/domain/vocabulary/enums";
import type { AnalysisResult } from "@/lib/domain/analysis/types";
import type { SiteInclusion } from "./site-inclusion";

/** Analysis settings chosen at publication (the same for every trait in one version). */
export interface PublishSettings {
  siteModel: "random" | "fixed";
  separation: "lsd" | "tukey";
  /** also publish the REML mixed model of each trait (absent in versions published before it existed) */
  mixed?: boolean;
  /** the PDF report adds each trait's stability across sites (absent, so no, in versions published before it was offered) */
  stabilityInReport?: boolean;
}

export interface PublishedSite {
  /** null for a site published without its name (see site-naming.ts), so no public address leads to it */
  id: number | null;
  name: string;
  kind: string;
  region: string;
  growingSetup: string;
  soil: string | null;
  irrigation: string | null;
  publicDescription: string | null;
  sownOn: string | null;
}

export interface PublishedEntry {
  blindCode: string;
  entryNumber: number;
  varietyId: number;
  variety: string;
  isCheck: boolean;
  seedSource: string | null;
  lotCode: string | null;
  labelGermination: number | null;
  treated: boolean;
}

export interface PublishedTrait {
  id: number;
  code: string;
  name: string;
  unit: string | null;
  valueType: string;
  analysedAs: string;
  description: string | null;
  /** absent in versions published before traits had a direction */
  betterWhen?: BetterWhen;
}

/** One raw value as published (plot level, decoded). */
export interface PublishedValue {
  site: string;
  block: number;
  plotCode: string;
  blindCode: string;
  variety: string;
  trait: string;
  unit: string | null;
  /** the analysed value (dates become days from sowing); null for a missing plot */
  value: number | null;
  status: "used" | "missing" | "excluded";
  /** why a missing plot has no value ("animal damage", "not recorded"); absent in versions published before it was kept */
  missingReason?: string | null;
  /** the plot's seeds sown and seedlings emerged (final stand), when the trial counts them; absent in older versions */
  seedsSown?: number | null;
  emerged?: number | null;
}

/**
 * The immutable content of one published version: everything the public pages, downloads and the PDF
 * show, frozen at publication so later data changes never alter it. No contact details, no user names.
 */
export interface PublishedSnapshot {
  schemaVersion: 1;
  version: number;
  publishedAt: string;
  changeNote: string | null;
  settings: PublishSettings;
  program: string;
  trial: {
    id: number;
    code: string;
    title: string;
    crop: string;
    cropGroup: string;
    season: string;
    year: number;
    purpose: string | null;
    design: string;
    blocks: number;
    plotUnit: string;
    plotSize: number;
    protocol: string | null;
  };
  /** null when the whole trial is published; otherwise the one trait published */
  scopeTraitId: number | null;
  /** every enrolled site */
  sites: PublishedSite[];
  /** which enrolled sites this version includes and why not the others (absent in versions published before it was kept) */
  siteInclusion?: SiteInclusion[];
  entries: PublishedEntry[];
  traits: PublishedTrait[];
  results: { traitId: number; result: AnalysisResult }[];
  summary: string[];
  data: PublishedValue[];
  citation: string;
}
