// The manifest of a release package (manifest.json, written last in the zip): every other file's
// SHA-256 and size, the take, the motion base, cueing and budget versions, the reviews and the release
// with who and when, the software version and the layout of the controller's binary file. The package
// builder writes it, `legwork verify` and the tests read it through this one schema.
import { z } from 'zod';
import { manifestFileSchema } from './run-outputs';
import { personSchema, reviewSchema, versionRefSchema } from './review';

export const MANIFEST_NAME = 'manifest.json';

export const frameLayoutSchema = z.object({
  file: z.string().min(1),
  format: z.enum(['float32', 'int32']),
  byteOrder: z.literal('little-endian'),
  valuesPerFrame: z.number().int().positive(),
  bytesPerFrame: z.number().int().positive(),
  frames: z.number().int().nonnegative(),
  rate_hz: z.number().positive(),
  columns: z.array(z.string()),
  unit: z.enum(['mm', 'counts']),
  zero: z.string(),
  header: z.literal('none'),
});

/** A time series at the controller rate in the package: CSV with time_s first, then these columns. */
export const seriesFileSchema = z.object({
  file: z.string().min(1),
  unit: z.string(),
  rate_hz: z.number().positive(),
  describes: z.string(),
  columns: z.array(z.string()),
});

export const packageManifestSchema = z.object({
  format: z.literal('legwork-release-package'),
  formatVersion: z.literal(1),
  softwareVersion: z.string().min(1),
  release: z.object({ id: z.string(), releasedBy: personSchema, releasedAt: z.string() }),
  run: z.object({ id: z.string(), state: z.string() }),
  track: z.object({ id: z.string(), title: z.string() }),
  take: z.object({ id: z.string(), number: z.number().int(), sha256: z.string(), filename: z.string() }),
  venue: z.object({ id: z.string(), name: z.string(), timeZone: z.string() }),
  /** Motion bases carry no version number: the SHA-256 of the geometry's JSON identifies the one used. */
  motionBase: z.object({ id: z.string(), name: z.string(), sha256: z.string().regex(/^[0-9a-f]{64}$/) }),
  /** Null for a pose or legs take, which is not cued. */
  cueing: versionRefSchema.nullable(),
  budget: versionRefSchema,
  filmSync: z.record(z.string(), z.unknown()).nullable(),
  reviews: z.array(reviewSchema),
  controller: z.object({
    csv: z.string(),
    binary: frameLayoutSchema,
    /** Encoder counts, when the venue's controller takes them: round(mm x countsPerMm + zeroOffset_counts). */
    counts: z
      .object({
        csv: z.string(),
        binary: frameLayoutSchema,
        countsPerMm: z.number().positive(),
        zeroOffset_counts: z.number().int(),
      })
      .optional(),
    /**
     * The ramps from neutral at rest into the show and back out of it, inside the files: the show's
     * first and last frames (0-based) and the ramp profile. Absent in runs made without ramps.
     */
    ramp: z
      .object({
        in_s: z.number().nonnegative(),
        out_s: z.number().nonnegative(),
        profile: z.string(),
        showStartFrame: z.number().int().nonnegative(),
        showEndFrame: z.number().int().nonnegative(),
      })
      .optional(),
  }),
  /** The time series beside the controller files (absent in packages built before they were listed). */
  series: z.array(seriesFileSchema).optional(),
  files: z.array(manifestFileSchema),
});
export type PackageManifest = z.infer<typeof packageManifestSchema>;
