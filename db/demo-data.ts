// The invented demo scenario: the Tamarack Valley Extension District and its partner farms and gardens.
// Every name, place and number here is made up for demonstration.

export const DEMO_PASSWORDS = {
  admin: "seedplot-admin-demo",
  coordinator: "seedplot-coordinator-demo",
  cooperator: "seedplot-grower-demo",
} as const;

export const DEMO_STAFF = [
  { email: "ada.okafor@tamarack-valley.example", name: "Ada Okafor", role: "admin" as const },
  { email: "rosa.delgado@tamarack-valley.example", name: "Rosa Delgado", role: "coordinator" as const },
];

export const DEMO_SITES = [
  { name: "Willow Bend Farm", kind: "farm", region: "Upper Tamarack", growingSetup: "field", soil: "silt loam", irrigation: "drip", lat: 45.212, lon: -92.114, grower: { name: "Tomas Brenner", email: "tomas@willowbend.example" } },
  { name: "Cedar Hollow Market Garden", kind: "garden", region: "Cedar Hollow", growingSetup: "high_tunnel", soil: "sandy loam", irrigation: "drip", lat: 45.181, lon: -92.231, grower: { name: "Mei Lin Harrow", email: "mei@cedarhollow.example" } },
  { name: "Three Stones Farm", kind: "farm", region: "Lower Tamarack", growingSetup: "greenhouse", soil: "potting mix in trays", irrigation: "overhead mist", lat: 45.097, lon: -92.05, grower: { name: "Kwame Asante", email: "kwame@threestones.example" } },
  { name: "Maple Run Community Garden", kind: "garden", region: "Fernbrook", growingSetup: "field", soil: "clay loam, raised beds", irrigation: "hand watering", lat: 45.144, lon: -92.3, grower: { name: "Ingrid Solberg", email: "ingrid@maplerun.example" } },
  { name: "Fernbrook School Garden", kind: "garden", region: "Fernbrook", growingSetup: "indoor_lights", soil: "soilless mix", irrigation: "bottom watering", lat: 45.151, lon: -92.288, grower: { name: "Dev Raman", email: "dev@fernbrookschool.example" } },
  { name: "Larkspur Acres", kind: "farm", region: "North Ridge", growingSetup: "field", soil: "loam", irrigation: "overhead", lat: 45.33, lon: -92.19, grower: { name: "Hannah Okoye", email: "hannah@larkspur.example" } },
  { name: "Brightwater Flower Farm", kind: "farm", region: "Brightwater", growingSetup: "greenhouse", soil: "potting mix in trays", irrigation: "drip", lat: 45.262, lon: -91.98, grower: { name: "Luis Ferrante", email: "luis@brightwater.example" } },
] as const;

export const DEMO_TRAITS = [
  { code: "seeds_sown", betterWhen: "neither", name: "Seeds sown", unit: "seeds", valueType: "count", min: 0, max: 500, dueNote: "At sowing", dueBy: 0, computation: "none" },
  { code: "emergence_count", betterWhen: "higher", name: "Seedlings emerged (count)", unit: "seedlings", valueType: "count", min: 0, max: 500, due: [5, 7, 10, 14], computation: "none", description: "Seedlings with cotyledons fully above the surface, counted on the scheduled days after sowing." },
  { code: "emerged_final", betterWhen: "higher", name: "Seedlings emerged (final)", unit: "seedlings", valueType: "count", min: 0, max: 500, dueNote: "14 days after sowing", dueBy: 14, computation: "none" },
  { code: "emergence_date", betterWhen: "lower", name: "Emergence date", unit: "date", valueType: "date", dueNote: "When half the cells show a seedling", dueBy: 14, computation: "days_from_sowing", description: "Analysed as days to emergence from the sowing date." },
  { code: "harvest_date", betterWhen: "neither", name: "First harvest date", unit: "date", valueType: "date", dueNote: "At first marketable harvest", computation: "days_from_sowing", description: "Analysed as days to maturity from the sowing date." },
  { code: "marketable_yield", betterWhen: "higher", name: "Marketable yield", unit: "g per plot", valueType: "number", min: 0, max: 20000, dueNote: "At harvest", computation: "none" },
  { code: "quality", betterWhen: "higher", name: "Overall quality", unit: "1-9", valueType: "rating", min: 1, max: 9, dueNote: "At harvest", computation: "none", description: "1 = unmarketable, 5 = acceptable, 9 = excellent." },
  { code: "bolting", betterWhen: "lower", name: "Bolting at harvest", unit: "yes/no", valueType: "yes_no", dueNote: "At harvest", computation: "none" },
  { code: "maturity_date", betterWhen: "neither", name: "Maturity date", unit: "date", valueType: "date", dueNote: "When most plants are ready to harvest", computation: "days_from_sowing", description: "Analysed as days to maturity from the sowing date." },
  { code: "first_bloom_date", betterWhen: "neither", name: "First bloom date", unit: "date", valueType: "date", dueNote: "When the first flower opens", computation: "days_from_sowing", description: "Analysed as days to first bloom from the sowing date (flowers)." },
  { code: "stem_length", betterWhen: "higher", name: "Stem length", unit: "cm", valueType: "number", min: 0, max: 300, dueNote: "At harvest", computation: "none", description: "Cut-flower stems, from the cut to the tip, in centimetres." },
  { code: "cull_yield", betterWhen: "lower", name: "Cull yield", unit: "g per plot", valueType: "number", min: 0, max: 20000, dueNote: "At harvest", computation: "none", description: "Harvested weight that is not marketable." },
  { code: "plot_notes", betterWhen: "neither", name: "Plot notes", unit: null, valueType: "text", dueNote: "Any time", computation: "none" },
] as const;

export const DEMO_CROPS = [
  { name: "Lettuce", cropGroup: "leafy_greens", scientificName: "Lactuca sativa" },
  { name: "Spinach", cropGroup: "leafy_greens", scientificName: "Spinacia oleracea" },
  { name: "Kale", cropGroup: "brassicas", scientificName: "Brassica oleracea (Acephala group)" },
] as const;

export interface DemoEntry {
  variety: string;
  source: string;
  labelGermination: number | null;
  packetDays: number;
  treated?: boolean;
  isCheck?: boolean;
  // The invented "true" behaviour used to generate plausible data.
  effect: { yield: number; days: number; emergence: number; quality: number };
}

export interface DemoTrial {
  code: string;
  title: string;
  crop: (typeof DEMO_CROPS)[number]["name"];
  /** "lastSpring" is the spring a year before "spring": a second season of a crop for the across-seasons views */
  season: "lastSpring" | "spring" | "winter";
  status: "analysing" | "collecting";
  /**
   * Published when the demo is loaded (every site accepted, then the publish use case), so a newcomer sees
   * results, variety pages and the PDF at once; the other analysing trial keeps one site in review.
   */
  publishedAtSeed?: boolean;
  /** sites (by index into DEMO_SITES) whose growers did not agree to be named in public results */
  unnamedSiteIndexes?: number[];
  blocks: number;
  plotUnit: "insert" | "bed_row";
  plotSize: number;
  purpose: string;
  siteIndexes: number[];
  traits: string[];
  baseline: { yield: number; days: number; emergence: number; quality: number };
  entries: DemoEntry[];
}

export const DEMO_TRIALS: DemoTrial[] = [
  {
    code: "TV26-LET",
    title: "Leaf lettuce for spring markets",
    crop: "Lettuce",
    season: "spring",
    status: "analysing",
    blocks: 4,
    plotUnit: "bed_row",
    plotSize: 10,
    purpose: "Which leaf lettuces give the most marketable heads in an early spring planting, and which hold without bolting?",
    siteIndexes: [0, 1, 2, 3, 5, 6],
    traits: ["seeds_sown", "emerged_final", "emergence_date", "harvest_date", "marketable_yield", "quality", "bolting", "plot_notes"],
    baseline: { yield: 2400, days: 48, emergence: 0.86, quality: 6 },
    entries: [
      { variety: "Copper Ruffle", source: "Hollowtree Seed Co.", labelGermination: 90, packetDays: 46, effect: { yield: 150, days: -2, emergence: 0.02, quality: 0.6 } },
      { variety: "Tamarack Green Leaf", source: "Tamarack Seed Library", labelGermination: 85, packetDays: 50, isCheck: true, effect: { yield: 0, days: 0, emergence: 0, quality: 0 } },
      { variety: "Velvet Oak", source: "Northern Furrow Seeds", labelGermination: 92, packetDays: 52, effect: { yield: -220, days: 3, emergence: 0.04, quality: 0.9 } },
      { variety: "Prairie Bibb", source: "Hollowtree Seed Co.", labelGermination: 88, packetDays: 55, effect: { yield: -400, days: 6, emergence: -0.05, quality: -0.4 } },
      { variety: "Frostline Romaine", source: "Northern Furrow Seeds", labelGermination: null, packetDays: 58, effect: { yield: 420, days: 8, emergence: -0.02, quality: 0.3 } },
      { variety: "Sundew Batavian", source: "Tamarack Seed Library", labelGermination: 80, packetDays: 50, effect: { yield: 250, days: 2, emergence: -0.09, quality: 0.1 } },
    ],
  },
  {
    code: "TV26-SPN",
    title: "Bolt-resistant spinach",
    crop: "Spinach",
    season: "spring",
    status: "analysing",
    publishedAtSeed: true,
    // The community garden's volunteers asked not to be named: it is published as "Site N, Fernbrook".
    unnamedSiteIndexes: [3],
    blocks: 3,
    plotUnit: "bed_row",
    plotSize: 12,
    purpose: "Spinach varieties that size up before lengthening days make them bolt.",
    siteIndexes: [0, 3, 5, 6],
    traits: ["seeds_sown", "emerged_final", "emergence_date", "harvest_date", "marketable_yield", "bolting"],
    baseline: { yield: 1600, days: 44, emergence: 0.72, quality: 6 },
    entries: [
      { variety: "Winter Shield", source: "Northern Furrow Seeds", labelGermination: 85, packetDays: 42, effect: { yield: 200, days: -1, emergence: 0.05, quality: 0 } },
      { variety: "Glacier Savoy", source: "Hollowtree Seed Co.", labelGermination: 80, packetDays: 45, isCheck: true, effect: { yield: 0, days: 0, emergence: 0, quality: 0 } },
      { variety: "Riverbend Smooth", source: "Tamarack Seed Library", labelGermination: 75, packetDays: 40, effect: { yield: -150, days: -3, emergence: -0.06, quality: 0 } },
      { variety: "Nightjar", source: "Northern Furrow Seeds", labelGermination: 90, packetDays: 48, effect: { yield: 320, days: 3, emergence: 0.03, quality: 0 } },
      { variety: "Bramble Flat", source: "Hollowtree Seed Co.", labelGermination: 70, packetDays: 44, effect: { yield: -60, days: 1, emergence: -0.1, quality: 0 } },
    ],
  },
  {
    code: "TV27-KAL",
    title: "Baby-leaf kale in trays under lights",
    crop: "Kale",
    season: "winter",
    status: "collecting",
    blocks: 3,
    plotUnit: "insert",
    plotSize: 6,
    purpose: "Fast, even emergence and early baby-leaf cuts for winter tray production.",
    siteIndexes: [0, 1, 2, 4, 5, 6],
    traits: ["seeds_sown", "emergence_count", "emergence_date", "harvest_date", "marketable_yield", "quality"],
    baseline: { yield: 180, days: 24, emergence: 0.85, quality: 6 },
    entries: [
      { variety: "Heron Lacinato", source: "Hollowtree Seed Co.", labelGermination: 90, packetDays: 25, effect: { yield: 15, days: 1, emergence: 0.03, quality: 0.5 } },
      { variety: "Ember Red", source: "Northern Furrow Seeds", labelGermination: 85, packetDays: 24, effect: { yield: -10, days: 0, emergence: -0.04, quality: 0.2 } },
      { variety: "Thistledown Curly", source: "Tamarack Seed Library", labelGermination: 88, packetDays: 22, isCheck: true, effect: { yield: 0, days: 0, emergence: 0, quality: 0 } },
      { variety: "Northwind Siberian", source: "Northern Furrow Seeds", labelGermination: 92, packetDays: 21, treated: true, effect: { yield: 25, days: -2, emergence: 0.06, quality: -0.2 } },
      { variety: "Dusk Purple", source: "Hollowtree Seed Co.", labelGermination: 78, packetDays: 26, effect: { yield: -25, days: 2, emergence: -0.1, quality: 0.4 } },
      { variety: "Mossy Dwarf", source: "Tamarack Seed Library", labelGermination: 84, packetDays: 23, effect: { yield: 5, days: 1, emergence: -0.02, quality: -0.5 } },
    ],
  },
  // The spring before TV26-LET: four of its varieties were grown then too, so the lettuce varieties have
  // more than one season to compare (the across-seasons page and each variety's history). Last in the list, so
  // the other trials draw the same random numbers as before it was added.
  {
    code: "TV25-LET",
    title: "Leaf lettuce for spring markets, first year",
    crop: "Lettuce",
    season: "lastSpring",
    status: "analysing",
    publishedAtSeed: true,
    blocks: 3,
    plotUnit: "bed_row",
    plotSize: 10,
    purpose: "A first look at leaf lettuces for an early spring planting: marketable heads and bolting.",
    siteIndexes: [0, 1, 2, 5],
    traits: ["seeds_sown", "emerged_final", "emergence_date", "harvest_date", "marketable_yield", "quality", "bolting"],
    baseline: { yield: 2250, days: 49, emergence: 0.84, quality: 6 },
    entries: [
      { variety: "Copper Ruffle", source: "Hollowtree Seed Co.", labelGermination: 91, packetDays: 46, effect: { yield: 120, days: -2, emergence: 0.02, quality: 0.5 } },
      { variety: "Tamarack Green Leaf", source: "Tamarack Seed Library", labelGermination: 86, packetDays: 50, isCheck: true, effect: { yield: 0, days: 0, emergence: 0, quality: 0 } },
      { variety: "Velvet Oak", source: "Northern Furrow Seeds", labelGermination: 90, packetDays: 52, effect: { yield: -180, days: 3, emergence: 0.03, quality: 0.8 } },
      { variety: "Prairie Bibb", source: "Hollowtree Seed Co.", labelGermination: 87, packetDays: 55, effect: { yield: -350, days: 5, emergence: -0.04, quality: -0.3 } },
      { variety: "Lantern Red Leaf", source: "Northern Furrow Seeds", labelGermination: 83, packetDays: 49, effect: { yield: -90, days: 1, emergence: -0.06, quality: 0.2 } },
    ],
  },
];

/**
 * A second, smaller program with its own coordinator, grower, site, varieties, trait and a draft trial. It
 * shows programs working side by side without seeing each other's sites, growers, varieties or trials.
 */
export const DEMO_SECOND_PROGRAM = {
  slug: "juniper-flats",
  name: "Juniper Flats Salad Greens Circle",
  description: "A small growers' circle around Juniper Flats trying salad greens for the shoulder seasons.",
  coordinator: { email: "owen.marsh@juniper-flats.example", name: "Owen Marsh" },
  site: { name: "Juniper Flats Farm", kind: "farm", region: "Juniper Flats", growingSetup: "high_tunnel", soil: "sandy loam", irrigation: "drip", lat: 44.912, lon: -91.724, grower: { name: "Priya Castellan", email: "priya@juniperflats.example" } },
  trait: { code: "tipburn", betterWhen: "lower", name: "Tipburn severity", unit: "1-9", valueType: "rating", min: 1, max: 9, dueNote: "At harvest", description: "1 = no browned leaf edges, 9 = most leaves browned." },
  trial: {
    code: "JF27-LET",
    title: "Butterhead lettuce for the autumn tunnel",
    crop: "Lettuce",
    purpose: "Which butterheads stay free of tipburn in a warm autumn tunnel?",
    traits: ["seeds_sown", "emerged_final", "marketable_yield", "tipburn"],
    entries: [
      { variety: "Juniper Butterhead", source: "Flats Seed Swap", labelGermination: 88, packetDays: 52 },
      { variety: "Marsh Gold", source: "Hollowtree Seed Co.", labelGermination: 91, packetDays: 49, isCheck: true },
    ],
  },
} as const;
