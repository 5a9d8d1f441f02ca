// Reviews of cue runs: a safety reviewer clears or holds a run with a written reason. The server keeps
// every review (who, when, the reason, the budget version the run was judged against).
import { z } from 'zod';
import { text } from './text';
import { runDetailSchema } from './pipeline';

export const REVIEW_DECISIONS = ['clear', 'hold'] as const;
export const reviewDecisionSchema = z.enum(REVIEW_DECISIONS);
export type ReviewDecision = z.infer<typeof reviewDecisionSchema>;

export const REVIEW_DECISION_LABELS: Record<ReviewDecision, string> = { clear: 'Cleared', hold: 'Held' };

/**
 * POST /api/studios/:id/runs/:run/review. The reason may be empty only when clearing a run with no
 * findings; a hold always needs one, and so does clearing a run with comfort findings.
 */
export const reviewBody = z.object({
  decision: reviewDecisionSchema,
  reason: text().trim().max(4000, 'at most 4000 characters').default(''),
});
export type ReviewBody = z.infer<typeof reviewBody>;

export const personSchema = z.object({ id: z.string(), name: z.string(), email: z.string() });
export type Person = z.infer<typeof personSchema>;

export const versionRefSchema = z.object({ id: z.string(), name: z.string(), version: z.number() });

export const reviewSchema = z.object({
  id: z.string().uuid(),
  runId: z.string().uuid(),
  decision: reviewDecisionSchema,
  reason: z.string(),
  reviewer: personSchema,
  /** The budget profile version the run was judged against. */
  budgetVersion: versionRefSchema,
  /** The run's state before and after this review. */
  fromState: z.string(),
  toState: z.string(),
  createdAt: z.string(),
});
export type Review = z.infer<typeof reviewSchema>;

/** One action the viewer may or may not take on a run, and why not. */
export const runActionSchema = z.object({
  allowed: z.boolean(),
  /** Set when the action needs a written reason. */
  reasonRequired: z.boolean(),
  /** Why it is not allowed (role, separation of duties, state, a hard finding), in plain words. */
  why: z.string().nullable(),
});
export type RunAction = z.infer<typeof runActionSchema>;

/**
 * GET /api/studios/:id/runs/:run/decision: what the run page shows at the top: every review, the
 * run's releases and what the viewer may do next.
 */
export const runDecisionSchema = z.object({
  runId: z.string().uuid(),
  state: z.string(),
  hardFindings: z.number().int(),
  comfortFindings: z.number().int(),
  reviews: z.array(reviewSchema),
  /** Release ids of this run, newest first (details under /releases/:id). */
  releaseIds: z.array(z.string().uuid()),
  actions: z.object({ clear: runActionSchema, hold: runActionSchema, release: runActionSchema }),
});
export type RunDecision = z.infer<typeof runDecisionSchema>;

/** POST .../review answers the run as GET .../runs/:run does, with every review of it, newest first. */
export const reviewedRunSchema = runDetailSchema.extend({ reviews: z.array(reviewSchema) });
export type ReviewedRun = z.infer<typeof reviewedRunSchema>;
