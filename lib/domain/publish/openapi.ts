/**
 * The OpenAPI 3.1 description of the open data API, served at /api/public/v1/openapi.json. Its schemas
 * describe the types in `open-data.ts` one for one; the contract test validates every answer of the demo
 * against this document, so the two cannot drift apart silently.
 */
import type { OpenAPIV3_1 } from "openapi-types";
import { BETTER_WHEN } from "@/lib/domain/vocabulary/enums";
import { API_BASE } from "./open-data";

type Schema = OpenAPIV3_1.SchemaObject;

const ref = (name: string): OpenAPIV3_1.ReferenceObject => ({ $ref: `#/components/schemas/${name}` });
const text = (description?: string): Schema => ({ type: "string", ...(description ? { description } : {}) });
const textOrNull = (description?: string): Schema => ({ type: ["string", "null"], ...(description ? { description } : {}) });
const numberOrNull = (description?: string): Schema => ({ type: ["number", "null"], ...(description ? { description } : {}) });
const integer = (description?: string): Schema => ({ type: "integer", ...(description ? { description } : {}) });
const object = (properties: Record<string, Schema | OpenAPIV3_1.ReferenceObject>, description?: string): Schema => ({
  type: "object",
  ...(description ? { description } : {}),
  required: Object.keys(properties),
  additionalProperties: false,
  properties,
});
const list = (items: Schema | OpenAPIV3_1.ReferenceObject, description?: string): Schema => ({ type: "array", items, ...(description ? { description } : {}) });

const schemas: Record<string, Schema> = {
  Links: object(
    {
      self: text("this trial in the API"),
      page: text("the trial's public web page"),
      report: text("the PDF report"),
      results: text("per-trait results in the API"),
      plots: text("plot data in the API"),
      csv: text("plot data as CSV"),
      xlsx: text("plot data, means, data dictionary and citation as an Excel workbook"),
    },
    "Addresses relative to this server.",
  ),
  TrialSummary: object({
    code: text("trial code, e.g. TV26-SPN"),
    title: text(),
    crop: text(),
    season: text(),
    year: integer(),
    sites: integer("partner sites in this version"),
    entries: integer("varieties in the trial"),
    version: integer("latest published version"),
    publishedAt: { type: "string", format: "date-time" },
    summary: text("first line of the plain-language summary"),
    links: ref("Links"),
  }),
  TrialIndex: object({
    trials: list(ref("TrialSummary")),
    crops: list(text(), "every crop with published results (for filtering)"),
    seasons: list(text(), "every season with published results (for filtering)"),
  }),
  Site: object({
    name: text(),
    kind: text("farm or garden"),
    region: text(),
    growingSetup: text(),
    soil: textOrNull(),
    irrigation: textOrNull(),
    description: textOrNull("the site's public description"),
    sownOn: { type: ["string", "null"], format: "date" },
  }),
  Trait: object({
    code: text("trait code, used in results and plot data"),
    name: text(),
    unit: textOrNull('unit of the published values; "days" for dates, which are published as days from sowing'),
    valueType: text("how the value was recorded: count, date, number, rating or yes_no"),
    betterWhen: { type: "string", enum: [...BETTER_WHEN], description: "which way is better; with neither, nothing is ranked" },
    description: textOrNull(),
  }),
  Entry: object({
    code: text("blind code the growers saw during the trial"),
    variety: text(),
    isCheck: { type: "boolean", description: "the standard variety others are compared with (% of check)" },
    seedSource: textOrNull(),
    seedLot: textOrNull(),
    labelGerminationPercent: numberOrNull("germination stated on the seed label"),
    treatedSeed: { type: "boolean" },
  }),
  Trial: object({
    code: text(),
    title: text(),
    crop: text(),
    cropGroup: text(),
    season: text(),
    year: integer(),
    program: text(),
    purpose: textOrNull(),
    design: text("rcbd: randomised complete blocks at every site"),
    blocksPerSite: integer(),
    plotUnit: text(),
    plotSize: { type: "number" },
    protocol: textOrNull(),
    version: integer("the version this answer shows"),
    latestVersion: integer(),
    publishedAt: { type: "string", format: "date-time" },
    changeNote: textOrNull("what changed since the previous version"),
    citation: text(),
    analysis: object({
      siteModel: { type: "string", enum: ["random", "fixed"] },
      separation: { type: "string", enum: ["lsd", "tukey"] },
    }),
    publishedTrait: textOrNull("the one trait this version publishes, or null for the whole trial"),
    summary: list(text(), "plain-language summary for growers"),
    sites: list(ref("Site")),
    traits: list(ref("Trait")),
    entries: list(ref("Entry")),
    links: ref("Links"),
  }),
  Mean: object({
    entry: text("blind code"),
    variety: textOrNull(),
    isCheck: { type: "boolean" },
    mean: { type: "number", description: "least-squares mean when plots are missing, otherwise the plain mean" },
    se: numberOrNull("standard error of the mean"),
    n: integer("plots"),
    rank: { type: ["integer", "null"], minimum: 1, description: "1 = best for the trait's direction; null when betterWhen is neither" },
    groupLetters: textOrNull("entries sharing a letter are not clearly different (5% level)"),
    percentOfCheck: numberOrNull("mean as % of the check's mean (check = 100)"),
    checkDifference: numberOrNull("mean minus the check's mean"),
    beyondLsd: { type: ["boolean", "null"], description: "whether the difference to the check exceeds the LSD 0.05; null without an LSD" },
  }),
  Block: object({
    cv: numberOrNull("coefficient of variation, %"),
    lsd: numberOrNull("least significant difference at 5%; null when the varieties did not differ"),
    entryP: numberOrNull("p-value of the variety test"),
    comparison: text("what the comparison of means shows, in one sentence"),
    means: list(ref("Mean"), "in the stated order: best first, or lowest (earliest) first when betterWhen is neither"),
  }),
  TraitResult: object({
    trait: text("trait code"),
    name: text(),
    unit: textOrNull(),
    betterWhen: { type: "string", enum: [...BETTER_WHEN] },
    order: text("how the means are ordered, in words"),
    scope: { type: "string", enum: ["across sites", "one site"] },
    sites: integer(),
    problem: textOrNull("why there is no result, when there is none"),
    result: { anyOf: [ref("Block"), { type: "null" }] },
    bySite: list(
      object({
        site: text(),
        problem: textOrNull(),
        result: { anyOf: [ref("Block"), { type: "null" }] },
      }),
    ),
  }),
  Results: object({
    trial: text(),
    version: integer(),
    results: list(ref("TraitResult")),
  }),
  Plot: object({
    site: text(),
    block: integer(),
    plot: text("plot code printed on the plot label"),
    entry: text("blind code"),
    variety: text(),
    trait: text("trait code"),
    unit: textOrNull(),
    value: numberOrNull("the analysed value; null for a missing plot"),
    status: { type: "string", enum: ["used", "missing", "excluded"] },
    missingReason: textOrNull("why a missing plot has no value"),
    seedsSown: { type: ["integer", "null"] },
    emerged: { type: ["integer", "null"], description: "seedlings emerged (final count)" },
  }),
  Plots: object({
    trial: text(),
    version: integer(),
    plots: list(ref("Plot")),
  }),
  Error: {
    type: "object",
    required: ["error"],
    properties: { error: text("what went wrong, in plain words"), code: text() },
  },
};

const json = (schema: string, description: string): OpenAPIV3_1.ResponseObject => ({
  description,
  headers: { "Cache-Control": { schema: { type: "string" } } },
  content: { "application/json": { schema: ref(schema) } },
});

const notFound: OpenAPIV3_1.ResponseObject = {
  description: "No published results at this address (never published, withdrawn, or a malformed code or version)",
  content: { "application/json": { schema: ref("Error") } },
};

const codeParameter: OpenAPIV3_1.ParameterObject = {
  name: "code",
  in: "path",
  required: true,
  description: "trial code, e.g. TV26-SPN",
  schema: { type: "string", pattern: "^[A-Za-z0-9-]{1,40}$" },
};
const versionParameter: OpenAPIV3_1.ParameterObject = {
  name: "version",
  in: "query",
  required: false,
  description: "a published version; the latest when left out",
  schema: { type: "integer", minimum: 1 },
};
const filter = (name: string, description: string): OpenAPIV3_1.ParameterObject => ({ name, in: "query", required: false, description, schema: { type: "string", maxLength: 100 } });

// openapi-types intersects 3.1 path items with 3.0 operations, so a 3.1 schema (type: ["string", "null"])
// would not type-check inside one; each operation is checked as a 3.1 operation and then placed.
const getOnly = (operation: OpenAPIV3_1.OperationObject) => ({ get: operation }) as OpenAPIV3_1.PathItemObject;

export const OPENAPI_DOCUMENT = {
  openapi: "3.1.0",
  info: {
    title: "Seedplot open data",
    version: "1.0.0",
    description:
      "Published results of on-farm variety trials: trials, their traits and varieties, per-trait means with ranks, group letters and % of the check, and the plot data behind them. Read-only, no sign-in, published versions only.",
  },
  servers: [{ url: API_BASE }],
  paths: {
    "/trials": getOnly({
      operationId: "listTrials",
      summary: "Published trials, latest version of each",
      parameters: [filter("q", "free text: crop, variety, title or code"), filter("crop", "exact crop name"), filter("season", "exact season name")],
      responses: { "200": json("TrialIndex", "Published trials"), "400": { description: "A search term is too long", content: { "application/json": { schema: ref("Error") } } } },
    }),
    "/trials/{code}": getOnly({
      operationId: "getTrial",
      summary: "One published trial: sites, traits (with which way is better) and entries",
      parameters: [codeParameter, versionParameter],
      responses: { "200": json("Trial", "The trial as published"), "404": notFound },
    }),
    "/trials/{code}/results": getOnly({
      operationId: "getTrialResults",
      summary: "Per-trait results: mean, SE, plots, rank, group letters and % of check for every entry",
      parameters: [codeParameter, versionParameter],
      responses: { "200": json("Results", "Per-trait results"), "404": notFound },
    }),
    "/trials/{code}/plots": getOnly({
      operationId: "getTrialPlots",
      summary: "Plot data: every plot's value per trait, with missing reasons and seed counts",
      parameters: [codeParameter, versionParameter],
      responses: { "200": json("Plots", "Plot data"), "404": notFound },
    }),
    "/openapi.json": getOnly({
      operationId: "getOpenApi",
      summary: "This document",
      responses: { "200": { description: "OpenAPI 3.1 document", content: { "application/json": { schema: { type: "object" } } } } },
    }),
  },
  components: { schemas },
} satisfies OpenAPIV3_1.Document;
