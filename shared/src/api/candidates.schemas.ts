import { z } from 'zod';
import type { BlowupEstimate } from '../flow';

export const VERDICTS = ['confirmed', 'artefact', 'needs-finer-run'] as const;
export type Verdict = (typeof VERDICTS)[number];
export const BLOWUP_KINDS = ['type-I', 'type-II', 'infinite-time', 'inconclusive'] as const;

export interface CandidateEvidence {
  estimate: BlowupEstimate;
  /** Where max|∇u| sits (r), and at which pole it concentrates, if any. */
  gradMaxAt: number | null;
  pole: 'r = 0' | 'r = π' | 'r = 1' | 'interior' | null;
  /** Grid near the pole at the checkpoint the evidence was read from. */
  grid: { points: number; smallestCell: number; cellsWithinLambda: number; lambda: number } | null;
  /** t and step of the state the evidence was read from. */
  t: number;
  step: number;
}

export interface Candidate {
  id: string;
  runId: string;
  studyId: string;
  sweepId: string | null;
  foundWhileRunning: boolean;
  kind: (typeof BLOWUP_KINDS)[number];
  confidence: number;
  T: number | null;
  TUncertainty: number | null;
  exponent: number | null;
  exponentUncertainty: number | null;
  evidence: CandidateEvidence;
  checkpointId: string | null;
  verdict: Verdict | null;
  verdictNote: string | null;
  verdictBy: string | null;
  verdictAt: string | null;
  finerRunId: string | null;
  createdAt: string;
  /** The run's state and outcome now. */
  runState: string;
  runOutcome: string | null;
}

/** Plots of a candidate page, computed on request from the run's metrics and checkpoints. */
export interface CandidatePlots {
  /** (T̂ − t, max|∇u|) for a log-log plot; empty without a finite T̂. */
  gradientVsTimeToBlowup: [number, number][];
  /** Profiles h(√(T̂ − t)·y) against y for the last checkpoints (self-similarity check). */
  rescaledProfiles: { t: number; y: number[]; h: number[] }[];
  /** max|∇u| and ‖τ‖ against t (look-alike check: a steep steady state has falling tension). */
  history: { t: number; gradMax: number; tension: number; energy: number }[];
}

/** Comparison with the finer fork, once it has its own estimate. */
export interface FinerComparison {
  runId: string;
  state: string;
  outcome: string | null;
  T: number | null;
  exponent: number | null;
  /** Do T̂ and p agree within the two runs' combined uncertainties? null until both are known. */
  agrees: boolean | null;
}

export const verdictSchema = z.strictObject({
  verdict: z.enum(VERDICTS, { error: `verdict must be one of ${VERDICTS.join(', ')}` }),
  note: z.string().max(5_000, { error: 'note may have at most 5000 characters' }).default(''),
});
export type VerdictRequest = z.infer<typeof verdictSchema>;

export const candidateListQuerySchema = z.strictObject({
  studyId: z.string().uuid({ error: 'studyId must be an id' }).optional(),
  sweepId: z.string().uuid({ error: 'sweepId must be an id' }).optional(),
  kind: z.enum(BLOWUP_KINDS, { error: `kind must be one of ${BLOWUP_KINDS.join(', ')}` }).optional(),
  verdict: z.enum([...VERDICTS, 'none'], { error: `verdict must be one of ${VERDICTS.join(', ')}, none` }).optional(),
  sort: z.enum(['confidence', 'T', 'created'], { error: 'sort must be confidence, T or created' }).default('confidence'),
  order: z.enum(['asc', 'desc'], { error: 'order must be asc or desc' }).default('desc'),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
});
export type CandidateListQuery = z.infer<typeof candidateListQuerySchema>;
