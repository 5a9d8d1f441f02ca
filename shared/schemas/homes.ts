// What each role's home page lists: the work waiting for that role, most urgent first.
import { z } from 'zod';
import { runStateSchema } from './pipeline';
import { problemSchema, releaseSchema } from './release';

/** A run as the homes list it: enough to say what it is and how bad, and to open it. */
export const homeRunSchema = z.object({
  id: z.string().uuid(),
  trackId: z.string().uuid(),
  trackTitle: z.string(),
  takeNumber: z.number().int(),
  venueId: z.string().uuid(),
  venueName: z.string(),
  state: runStateSchema,
  hardFindings: z.number().int(),
  comfortFindings: z.number().int(),
  /** Worst use ratio over every check (1 = at a limit), and which check and subject. */
  worstRatio: z.number().nullable(),
  worstCheck: z.string().nullable(),
  finishedAt: z.string().nullable(),
  /** The latest review's decision and reason, when there is one. */
  lastReview: z
    .object({ decision: z.enum(['clear', 'hold']), reason: z.string(), by: z.string(), at: z.string() })
    .nullable(),
});
export type HomeRun = z.infer<typeof homeRunSchema>;

/** GET /api/studios/:id/home/review: runs awaiting review or held by budget, worst findings first. */
export const reviewQueueSchema = z.object({ runs: z.array(homeRunSchema) });
export type ReviewQueue = z.infer<typeof reviewQueueSchema>;

/** GET /api/studios/:id/home/producer. */
export const producerHomeSchema = z.object({
  /** Held by budget or by a reviewer. */
  held: z.array(homeRunSchema),
  /** Cleared and not released (or whose release was withdrawn or failed). */
  clearedNotReleased: z.array(homeRunSchema),
  /** Problems venues reported, newest first, with the release they are about. */
  problems: z.array(z.object({ problem: problemSchema, release: releaseSchema })),
  /** Releases still building or whose build failed. */
  releasesInProgress: z.array(releaseSchema),
});
export type ProducerHome = z.infer<typeof producerHomeSchema>;

/** GET /api/studios/:id/home/engineer: held runs to cue again (a hard finding, or held by a reviewer). */
export const engineerHomeSchema = z.object({ held: z.array(homeRunSchema) });
export type EngineerHome = z.infer<typeof engineerHomeSchema>;

/** GET /api/studios/:id/home/operator: the releases of the operator's venues. */
export const operatorHomeSchema = z.object({
  /** Ready and not yet acknowledged as installed by anyone at the venue. */
  new: z.array(releaseSchema),
  /** Acknowledged as installed (ready or since superseded). */
  installed: z.array(releaseSchema),
  withdrawn: z.array(releaseSchema),
});
export type OperatorHome = z.infer<typeof operatorHomeSchema>;
