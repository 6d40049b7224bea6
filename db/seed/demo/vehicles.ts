import { vinYearCode, withVinCheckDigit } from "@/lib/vin";
import type { Random } from "./random";
import {
  MAKES,
  MODELS,
  findGeneration,
  type GenerationDef,
  type MakeName,
  type ModelName,
} from "./scenario";
import type { DemoGeneration } from "./types";

/** A vehicle while the generator works on it (day numbers, not dates). */
export type Vehicle = {
  vin: string;
  unitNumber: string | null;
  make: MakeName;
  model: ModelName;
  modelYear: number;
  engine: string;
  transmission: string;
  /** Day number (from DEMO_START) the vehicle entered service; negative when before. */
  inServiceDay: number;
  generation: GenerationDef | undefined;
};

/** Restraint-system codes for VIN position 7; a letter marks the 2010–2039 model-year cycle. */
const RESTRAINT_LETTERS = "ABCDEFGH";
const RESTRAINT_DIGITS = "12345";

/** Makes the VIN of a new vehicle (model, model year, engine code for position 6). */
export type MakeVin = (model: ModelName, modelYear: number, engineCode: string) => string;

/**
 * Makes synthetic VINs: invented manufacturer identifiers, a valid check digit (49 CFR 565),
 * the model-year code in position 10 and, as for light vehicles since the 2008 amendment
 * (73 FR 23367), a digit in position 7 before model year 2010 and a letter from 2010 on.
 * Serial numbers only go up per manufacturer identifier, so every VIN is unique.
 */
export function createVinFactory(rng: Random): MakeVin {
  const serials = new Map<string, number>();
  return (modelName, modelYear, engineCode) => {
    const model = MODELS[modelName];
    const make = MAKES[model.make];
    const serial = (serials.get(make.wmi) ?? 204000) + rng.int(1, 7);
    serials.set(make.wmi, serial);
    const series = findGeneration(modelName, modelYear)?.series ?? model.fallbackSeries;
    const restraint = rng.pick([...(modelYear >= 2010 ? RESTRAINT_LETTERS : RESTRAINT_DIGITS)]);
    const body = rng.pick([...model.bodies]);
    const plant = rng.pick([...make.plants]);
    const draft = `${make.wmi}${model.vinModel}${body}${engineCode}${restraint}${series}0${vinYearCode(modelYear)}${plant}${String(serial).padStart(6, "0")}`;
    return withVinCheckDigit(draft);
  };
}

/** Builds a vehicle of a model and model year with engine, transmission and generation. */
export function createVehicle(
  rng: Random,
  makeVin: MakeVin,
  modelName: ModelName,
  modelYear: number,
  inServiceDay: number,
  unitNumber: string | null = null,
): Vehicle {
  const model = MODELS[modelName];
  const engine = rng.pick(model.engines);
  return {
    vin: makeVin(modelName, modelYear, engine.code),
    unitNumber,
    make: model.make,
    model: modelName,
    modelYear,
    engine: engine.label,
    transmission: rng.pick(model.transmissions),
    inServiceDay,
    generation: findGeneration(modelName, modelYear),
  };
}

/** The generation catalogue rows of the models an organisation holds. */
export function listGenerations(models: readonly ModelName[]): DemoGeneration[] {
  return models.flatMap((name) =>
    MODELS[name].generations.map((g) => ({
      make: MODELS[name].make,
      model: name,
      label: g.label,
      yearFrom: g.yearFrom,
      yearTo: g.yearTo,
    })),
  );
}

/** The keys a fault's cohort factors may name: the model, and model plus generation. */
export function cohortKeysOf(vehicle: Vehicle): string[] {
  return vehicle.generation
    ? [vehicle.model, `${vehicle.model} ${vehicle.generation.label}`]
    : [vehicle.model];
}
