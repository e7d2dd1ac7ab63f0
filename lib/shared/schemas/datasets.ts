/**
 * The dataset API's inputs (query strings and bodies), shared by the route handlers, the dataset
 * page's forms and the OpenAPI document.
 */
import { z } from "zod";
import { strictObject } from "@/kinematics";

const columnName = z
  .string({ error: "must be a column name" })
  .trim()
  .min(1, { error: "must not be empty" })
  .max(200, { error: "must be at most 200 characters" });

/**
 * Where a dataset's data is (kinematics ColumnMapping); every field optional, defaults in the engine.
 * An unknown key is refused with the field it was probably meant to be (a misspelt `timeColumn`
 * would otherwise audit with the default time column).
 */
export const columnMappingSchema = strictObject({
  episodeColumn: columnName.optional(),
  timeColumn: columnName.optional(),
  rateHz: z
    .number({ error: "must be a number" })
    .positive({ error: "must be greater than 0" })
    .max(100_000, { error: "must be at most 100000" })
    .optional(),
  jointColumns: z
    .array(columnName, { error: "must be a list of column names" })
    .min(1, { error: "must name at least one column" })
    .max(64)
    .optional(),
  jointsColumn: columnName.optional(),
})
  .refine((m) => !(m.timeColumn !== undefined && m.rateHz !== undefined), {
    error: "give timeColumn or rateHz, not both",
    path: ["rateHz"],
  })
  .refine((m) => !(m.jointColumns !== undefined && m.jointsColumn !== undefined), {
    error: "give jointColumns or jointsColumn, not both",
    path: ["jointsColumn"],
  });

export type ColumnMappingInput = z.infer<typeof columnMappingSchema>;

/** Query string of a dataset upload; the body is the file (Parquet, zip or CSV). */
export const uploadDatasetQuery = z.strictObject({
  name: z
    .string({ error: "is required" })
    .trim()
    .min(1, { error: "must not be empty" })
    .max(120, { error: "must be at most 120 characters" }),
});

/** The arm and column mapping to audit a dataset with (also the preview's input). */
export const datasetMappingSchema = strictObject({
  armId: z.string({ error: "is required" }).uuid({ error: "must be an id" }),
  /** The arm revision (default: the newest). */
  revision: z.number({ error: "must be a number" }).int().positive().optional(),
  mapping: columnMappingSchema.default({}),
});

export type DatasetMappingInput = z.infer<typeof datasetMappingSchema>;

/** Which episodes a repair applies to: the listed indices (0-based), or every episode with findings. */
export const repairDatasetSchema = z.strictObject({
  episodes: z
    .array(
      z
        .number({ error: "must be an episode index (0 for the first episode)" })
        .int({ error: "must be a whole number" })
        .min(0, { error: "must be 0 or greater" }),
    )
    .max(100_000, { error: "must list at most 100000 episodes" })
    .optional(),
});

/** An episode's place in its dataset, from the path (0-based). */
export const episodeIndexParam = z.coerce
  .number({ error: "must be an episode index" })
  .int({ error: "must be a whole number" })
  .min(0, { error: "must be 0 or greater" });
