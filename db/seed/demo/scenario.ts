/**
 * The demo's invented world: makes, models, generations, people, vendors and fuel stations.
 * Every name here is made up for Recurra's demo; none stands for a real manufacturer, model,
 * company or person.
 */

export type MakeName = "Aurel" | "Brindle" | "Ostra";

export type MakeDef = {
  /**
   * Manufacturer identifier for VIN positions 1–3. INVENTED for the demo and must never be
   * read as a real manufacturer's identifier: all start with "0", a character the region table
   * does not hand out (from memory), so they cannot collide with a real make's.
   */
  wmi: string;
  /** Short tag used in invented part numbers. */
  partTag: string;
  /** VIN position 11 (assembly plant) letters. */
  plants: string;
  dealer: string;
};

export const MAKES: Readonly<Record<MakeName, MakeDef>> = {
  Aurel: { wmi: "0AU", partTag: "AU", plants: "KL", dealer: "Portside Aurel dealer" },
  Brindle: { wmi: "0BR", partTag: "BR", plants: "GT", dealer: "Eastmoor Brindle dealer" },
  Ostra: { wmi: "0ST", partTag: "OS", plants: "W", dealer: "Ostra service centre" },
};

export type GenerationDef = {
  label: string;
  yearFrom: number;
  yearTo: number;
  /** VIN position 8 (series) for this generation. */
  series: string;
};

export type ModelName = "Kestrel" | "Merlin" | "Tern" | "Skua" | "Wren";

export type ModelDef = {
  make: MakeName;
  model: ModelName;
  /** VIN position 4. */
  vinModel: string;
  /** VIN position 5 candidates (body and trim). */
  bodies: string;
  engines: readonly { label: string; code: string }[];
  transmissions: readonly string[];
  /** Real-world fuel economy in delivery use, miles per US gallon. */
  mpg: number;
  /** Series letter for model years no generation covers. */
  fallbackSeries: string;
  generations: readonly GenerationDef[];
};

export const MODELS: Readonly<Record<ModelName, ModelDef>> = {
  Kestrel: {
    make: "Aurel",
    model: "Kestrel",
    vinModel: "K",
    bodies: "HJ",
    engines: [
      { label: "1.4 petrol", code: "2" },
      { label: "1.6 petrol", code: "4" },
    ],
    transmissions: ["6-speed automatic", "5-speed manual"],
    mpg: 33,
    fallbackSeries: "0",
    generations: [
      { label: "K1", yearFrom: 2009, yearTo: 2013, series: "1" },
      { label: "K2", yearFrom: 2014, yearTo: 2019, series: "2" },
      { label: "K3", yearFrom: 2020, yearTo: 2025, series: "3" },
    ],
  },
  Merlin: {
    make: "Aurel",
    model: "Merlin",
    vinModel: "M",
    bodies: "VW",
    engines: [{ label: "1.6 petrol", code: "4" }],
    transmissions: ["6-speed automatic"],
    mpg: 24,
    fallbackSeries: "0",
    generations: [
      { label: "M1", yearFrom: 2012, yearTo: 2018, series: "1" },
      { label: "M2", yearFrom: 2019, yearTo: 2025, series: "2" },
    ],
  },
  Tern: {
    make: "Brindle",
    model: "Tern",
    vinModel: "T",
    bodies: "SE",
    engines: [
      { label: "2.0 petrol", code: "5" },
      { label: "1.8 petrol", code: "3" },
    ],
    transmissions: ["continuously variable", "6-speed automatic"],
    mpg: 29,
    fallbackSeries: "1",
    generations: [
      { label: "T2", yearFrom: 2011, yearTo: 2016, series: "2" },
      { label: "T3", yearFrom: 2017, yearTo: 2023, series: "3" },
    ],
  },
  Skua: {
    make: "Brindle",
    model: "Skua",
    vinModel: "P",
    bodies: "CDR",
    engines: [
      { label: "3.5 V6 petrol", code: "7" },
      { label: "2.7 turbo petrol", code: "6" },
    ],
    transmissions: ["8-speed automatic", "6-speed automatic"],
    mpg: 18,
    fallbackSeries: "1",
    generations: [
      { label: "SK2", yearFrom: 2008, yearTo: 2015, series: "2" },
      { label: "SK3", yearFrom: 2016, yearTo: 2022, series: "3" },
      { label: "SK4", yearFrom: 2023, yearTo: 2027, series: "4" },
    ],
  },
  Wren: {
    make: "Ostra",
    model: "Wren",
    vinModel: "W",
    bodies: "AB",
    engines: [{ label: "1.2 petrol", code: "1" }],
    transmissions: ["5-speed manual", "continuously variable"],
    mpg: 38,
    fallbackSeries: "0",
    generations: [
      { label: "W1", yearFrom: 2011, yearTo: 2017, series: "1" },
      { label: "W2", yearFrom: 2018, yearTo: 2024, series: "2" },
    ],
  },
};

export function findGeneration(model: ModelName, modelYear: number): GenerationDef | undefined {
  return MODELS[model].generations.find((g) => modelYear >= g.yearFrom && modelYear <= g.yearTo);
}

// --- Tidewater Parcel Co-op: a delivery fleet -------------------------------------------------

/** A purchase of identical vehicles; fleets buy in batches, so model years cluster. */
export type FleetBatch = { model: ModelName; modelYear: number; count: number; inService: string };

export const TIDEWATER_BATCHES: readonly FleetBatch[] = [
  { model: "Kestrel", modelYear: 2011, count: 6, inService: "2011-03-14" },
  { model: "Kestrel", modelYear: 2013, count: 8, inService: "2013-02-04" },
  { model: "Kestrel", modelYear: 2014, count: 8, inService: "2014-04-07" },
  { model: "Kestrel", modelYear: 2016, count: 12, inService: "2016-03-01" },
  { model: "Kestrel", modelYear: 2017, count: 10, inService: "2017-05-15" },
  { model: "Kestrel", modelYear: 2019, count: 16, inService: "2019-02-11" },
  { model: "Kestrel", modelYear: 2021, count: 10, inService: "2021-03-22" },
  { model: "Kestrel", modelYear: 2023, count: 10, inService: "2023-01-16" },
  { model: "Kestrel", modelYear: 2025, count: 8, inService: "2025-01-13" },
  { model: "Kestrel", modelYear: 2026, count: 4, inService: "2026-01-19" },
  { model: "Merlin", modelYear: 2016, count: 6, inService: "2016-06-06" },
  { model: "Merlin", modelYear: 2018, count: 6, inService: "2018-04-09" },
  { model: "Merlin", modelYear: 2019, count: 8, inService: "2019-03-04" },
  { model: "Merlin", modelYear: 2020, count: 8, inService: "2020-02-17" },
  { model: "Merlin", modelYear: 2022, count: 8, inService: "2022-04-25" },
  { model: "Merlin", modelYear: 2024, count: 4, inService: "2024-03-11" },
  { model: "Tern", modelYear: 2015, count: 4, inService: "2015-05-18" },
  { model: "Tern", modelYear: 2018, count: 4, inService: "2018-06-04" },
  { model: "Tern", modelYear: 2021, count: 4, inService: "2021-07-12" },
];

export const TIDEWATER_TECHNICIANS = [
  { name: "Priya Hallam", comebackFactor: 0.8 },
  { name: "Marcus Delane", comebackFactor: 1 },
  { name: "Tomasz Rook", comebackFactor: 1.8 },
  { name: "Ines Farrow", comebackFactor: 1 },
] as const;

/** Outside vendors the fleet sends work to, by what they are good at. */
export const TIDEWATER_VENDORS = {
  general: { name: "Kittering Motor Repairs", comebackFactor: 2.5 },
  electrical: { name: "Greyquay Auto Electric", comebackFactor: 1 },
  transmission: { name: "Fenlow Transmission Works", comebackFactor: 0.8 },
  chassis: { name: "Ashcombe Brake & Steer", comebackFactor: 1 },
} as const;

export const IN_HOUSE = "In-house";

export const FUEL_STATIONS: readonly (readonly [string, number])[] = [
  ["Dockside Fuel Stop", 30],
  ["Harrow Lane Service Station", 18],
  ["Millpond Fuels", 14],
  ["Ferry Road Fuel & Go", 12],
  ["Quarry Hill Fuel Depot", 9],
  ["Cinder Street Gas", 7],
  ["Northfield Truck Stop", 6],
  ["Sandpiper Services", 4],
];

// --- Northgate Auto Clinic: an independent shop -----------------------------------------------

export const NORTHGATE_VEHICLES = 2000;

/** Share of the shop's customer base by model, and the model years seen. */
export const NORTHGATE_MIX: readonly {
  model: ModelName;
  share: number;
  years: [number, number];
}[] = [
  { model: "Kestrel", share: 26, years: [2007, 2026] },
  { model: "Merlin", share: 10, years: [2012, 2026] },
  { model: "Tern", share: 20, years: [2010, 2025] },
  { model: "Skua", share: 24, years: [2006, 2026] },
  { model: "Wren", share: 20, years: [2011, 2026] },
];

export const NORTHGATE_TECHNICIANS = [
  { name: "Hollis Fenwick", weight: 24, comebackFactor: 2.2 },
  { name: "Marta Quill", weight: 26, comebackFactor: 0.7 },
  { name: "Teo Varga", weight: 20, comebackFactor: 1 },
  { name: "Bea Lindqvist", weight: 18, comebackFactor: 0.9 },
  { name: "Calvin Ashdown", weight: 12, comebackFactor: 1.2 },
] as const;

// --- Organisations and accounts -----------------------------------------------------------------

export const TIDEWATER = {
  slug: "tidewater",
  name: "Tidewater Parcel Co-op",
  kind: "fleet",
} as const;
export const NORTHGATE = {
  slug: "northgate",
  name: "Northgate Auto Clinic",
  kind: "shop",
} as const;
