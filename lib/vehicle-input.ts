import { z } from "zod";
import { DISTANCE_UNITS } from "@/db/schema/organisations";
import { checkVin, normaliseVin } from "./vin";

const optionalText = (max: number) => z.string().trim().max(max).optional();

/**
 * A vehicle entered by hand or posted to the API. A VIN must be well-formed; a wrong check
 * digit is accepted (not required outside North America, 49 CFR 565 applies to US vehicles)
 * and reported back as a warning by the caller.
 */
export const NewVehicleInput = z
  .object({
    vin: z
      .string()
      .transform(normaliseVin)
      .refine((v) => v === "" || checkVin(v).isWellFormed, {
        message: "A VIN has 17 letters and digits, without I, O or Q.",
      })
      .refine((v) => v === "" || !checkVin(v).isPlaceholder, {
        message: "This VIN is a placeholder; leave it empty instead.",
      })
      .optional()
      .transform((v) => (v ? v : undefined)),
    unitNumber: optionalText(40),
    make: z.string().trim().min(1, "Make is required.").max(60),
    model: z.string().trim().min(1, "Model is required.").max(60),
    modelYear: z.coerce
      .number({ message: "Model year must be a year." })
      .int("Model year must be a whole year.")
      .min(1980, "Model year must be 1980 or later.")
      .max(2040, "Model year must be 2040 or earlier."),
    engine: optionalText(60),
    transmission: optionalText(60),
    inServiceDate: z.iso.date({ message: "Use a date like 2024-03-31." }).optional(),
    odometerUnit: z.enum(DISTANCE_UNITS).default("mi"),
  })
  .refine((v) => v.vin || v.unitNumber, {
    message: "Give a VIN or a unit number (or both).",
    path: ["vin"],
  });
export type NewVehicleInput = z.infer<typeof NewVehicleInput>;
