import { z } from 'zod';

/**
 * Caps on reading a drawing, kept in the firm's settings; an admin may raise them for a firm
 * whose drawings are large. The defaults are safety limits far above any truss drawing (no
 * source); the bounds keep a raised cap inside what the import worker's memory can hold.
 */
export const IMPORT_LIMIT_BOUNDS = {
  maxSegments: { min: 1_000, max: 2_000_000, default: 200_000 },
  maxBlockDepth: { min: 1, max: 200, default: 32 },
  timeLimitSeconds: { min: 1, max: 300, default: 20 },
} as const;

const bounded = (key: keyof typeof IMPORT_LIMIT_BOUNDS, what: string) => {
  const b = IMPORT_LIMIT_BOUNDS[key];
  const sentence = `Enter ${what} as a whole number from ${b.min.toLocaleString('en-US')} to ${b.max.toLocaleString('en-US')}.`;
  return z.number({ error: sentence }).int(sentence).min(b.min, sentence).max(b.max, sentence);
};

export const importLimitsSchema = z.object({
  /** Most line segments a drawing may explode into (blocks inside blocks multiplied out). */
  maxSegments: bounded('maxSegments', 'the most line segments'),
  /** Deepest nesting of blocks inside blocks. */
  maxBlockDepth: bounded('maxBlockDepth', 'the deepest block nesting'),
  /** Longest time reading one drawing may take, seconds. */
  timeLimitSeconds: bounded('timeLimitSeconds', 'the time limit in seconds'),
});
export type ImportLimits = z.infer<typeof importLimitsSchema>;

export const DEFAULT_IMPORT_LIMITS: ImportLimits = {
  maxSegments: IMPORT_LIMIT_BOUNDS.maxSegments.default,
  maxBlockDepth: IMPORT_LIMIT_BOUNDS.maxBlockDepth.default,
  timeLimitSeconds: IMPORT_LIMIT_BOUNDS.timeLimitSeconds.default,
};

export interface ImportLimitsView extends ImportLimits {
  /** Who last changed them ('' when never changed) and when (null: the defaults). */
  updatedBy: string;
  updatedAt: string | null;
}
