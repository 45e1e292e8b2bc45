import { z } from "zod";
import { APPLICATION_METHODS, FLOW_BASES, PROPORTIONER_TYPES } from "../foam/vocabulary";
import { checkbox, coordinate, optionalNumber } from "./form-fields";

export const StationFormSchema = z.object({
  code: z
    .string({ error: "Enter a short station code, e.g. S1." })
    .trim()
    .min(1, "Enter a short station code, e.g. S1.")
    .max(16, "A code has at most 16 characters.")
    .regex(/^[A-Za-z0-9-]+$/, "Use letters, digits and hyphens only."),
  name: z
    .string({ error: "Enter the station's name." })
    .trim()
    .min(1, "Enter the station's name.")
    .max(120, "A name has at most 120 characters."),
  address: z
    .string()
    .trim()
    .max(200, "An address has at most 200 characters.")
    .optional()
    .transform((value) => value ?? ""),
  latitude: coordinate("Latitude", 90),
  longitude: coordinate("Longitude", 180),
  active: checkbox,
});

export type StationFormValue = z.infer<typeof StationFormSchema>;

export const OutletSchema = z.object({
  name: z
    .string({ error: "Name the outlet, e.g. Crosslay 1." })
    .trim()
    .min(1, "Name the outlet, e.g. Crosslay 1.")
    .max(60, "An outlet name has at most 60 characters."),
  foamCapable: checkbox,
  defaultFlowGpm: optionalNumber("The default flow", { max: 10_000, positive: true }),
  defaultFlowBasis: z.enum(FLOW_BASES, { error: "Choose what the flow figure measures." }).default("water"),
  defaultMethod: z.enum(APPLICATION_METHODS, { error: "Choose a method." }).optional(),
});

export const ApparatusFormSchema = z
  .object({
    unitId: z
      .string({ error: "Enter the unit identifier, e.g. E1." })
      .trim()
      .min(1, "Enter the unit identifier, e.g. E1.")
      .max(24, "A unit identifier has at most 24 characters."),
    description: z
      .string()
      .trim()
      .max(160, "A description has at most 160 characters.")
      .optional()
      .transform((value) => value ?? ""),
    stationId: z.coerce.number({ error: "Choose a station." }).int().positive("Choose a station.").optional(),
    concentrateTankGal: optionalNumber("The concentrate tank size", { max: 100_000 }),
    proportionerType: z.enum(PROPORTIONER_TYPES, { error: "Choose a proportioner type from the list." }).optional(),
    proportionerMaxConcentrateGpm: optionalNumber("The proportioner's maximum concentrate rate", {
      max: 1_000,
      positive: true,
    }),
    waterFlowMinGpm: optionalNumber("The minimum water flow", { max: 20_000 }),
    waterFlowMaxGpm: optionalNumber("The maximum water flow", { max: 20_000, positive: true }),
    compressedAirCfm: optionalNumber("The compressed-air capacity", { max: 10_000 }),
    active: checkbox,
    outlets: z.array(OutletSchema).max(30, "At most 30 outlets.").default([]),
  })
  .superRefine((value, ctx) => {
    if (
      value.waterFlowMinGpm != null &&
      value.waterFlowMaxGpm != null &&
      value.waterFlowMinGpm > value.waterFlowMaxGpm
    ) {
      ctx.addIssue({
        code: "custom",
        path: ["waterFlowMaxGpm"],
        message: "The maximum water flow must be at least the minimum.",
      });
    }
    const seen = new Set<string>();
    value.outlets.forEach((outlet, index) => {
      const key = outlet.name.toLowerCase();
      if (seen.has(key)) {
        ctx.addIssue({ code: "custom", path: ["outlets", index, "name"], message: "Two outlets have this name." });
      }
      seen.add(key);
      if (outlet.defaultMethod === "compressed_air" && !value.compressedAirCfm) {
        ctx.addIssue({
          code: "custom",
          path: ["outlets", index, "defaultMethod"],
          message: "Compressed-air foam needs the apparatus's compressed-air capacity (cfm).",
        });
      }
    });
  });

export type ApparatusFormValue = z.infer<typeof ApparatusFormSchema>;
