/**
 * What the Studio asks the analysis service for, and what comes back over the
 * event stream. Plain data shared by the page and the server.
 */
import { z } from 'zod';
import type { FieldError } from '../http';

const Finite = z.number({ error: 'must be a finite number' });

export const StudioJobSchema = z.discriminatedUnion(
  'analysis',
  [
    z.object({ analysis: z.literal('equilibria'), exact: z.boolean().optional(), maxListed: z.number().int().min(1).max(20).optional() }),
    z.object({ analysis: z.literal('credibility'), exact: z.boolean().optional() }),
    z.object({ analysis: z.literal('sensitivity'), exact: z.boolean().optional() }),
    z.object({ analysis: z.literal('monte-carlo'), samples: z.number().int().min(10).max(200_000), seed: z.number().int().min(0).max(2 ** 31) }),
    z.object({ analysis: z.literal('qre'), lambda: Finite.min(0, { error: 'lambda must be 0 or more' }).max(1_000) }),
    z.object({
      analysis: z.literal('belief'),
      nodeId: z.string().min(1),
      team: z.string().min(1),
      restrained: z.string().min(1),
      lambda: Finite.min(0).max(1_000),
    }),
    z.object({
      analysis: z.literal('agreement'),
      stage: z.object({
        rowTeam: z.string().min(1),
        colTeam: z.string().min(1),
        payoffs: z.tuple([
          z.tuple([z.tuple([Finite, Finite]), z.tuple([Finite, Finite])]),
          z.tuple([z.tuple([Finite, Finite]), z.tuple([Finite, Finite])]),
        ]),
      }),
      gamma: Finite.min(0).max(Math.PI / 2 + 1e-9),
      steps: z.number().int().min(4).max(90).optional(),
    }),
  ],
  { error: 'analysis must be one of equilibria, credibility, sensitivity, monte-carlo, qre, belief, agreement' },
);

export type StudioJob = z.infer<typeof StudioJobSchema>;
export type AnalysisKind = StudioJob['analysis'];

export type JobEvent<R = unknown> =
  | { type: 'progress'; fraction: number; phase: string }
  | { type: 'done'; result: R; seconds: number }
  | { type: 'failed'; message: string; fields?: FieldError[] }
  | { type: 'cancelled' };
