/**
 * The shapes the rules module returns: findings about where measurements are not independent
 * (and other threats to the planned linear model), and the analysis the design calls for. Both
 * are plain JSON: they are stored with each design revision and sent through the API.
 */
import type { Citation } from '@/lib/citations';
import type { Analysis, Design } from '@/lib/design/schema';

export type { Citation };

export type Severity = 'blocker' | 'warning' | 'advice';

export interface Finding {
  ruleId: string;
  /** Stable within the rule (e.g. the level id), so a finding can be marked addressed. */
  key: string;
  severity: Severity;
  title: string;
  /** What was found, in plain words, naming the levels and counts of this design. */
  found: string;
  /** Why it matters, quantified from the design wherever a formula exists. */
  why: string;
  /** What to do. */
  todo: string;
  /** The recommended analysis in standard model notation, e.g. 'reading_score ~ programme + (1 | classroom)'. */
  model?: string;
  /** The quantified consequences, e.g. { designEffect, effectiveN, naiveTypeIError, unitsPerArm }. */
  numbers?: Record<string, number>;
  citations: Citation[];
  levelIds?: string[];
}

/**
 * One check. `severity` is the most serious level the rule raises; a rule may raise a finding
 * one step milder when the plan already deals with part of the problem (the finding says so).
 */
export interface Rule {
  id: string;
  title: string;
  severity: Severity;
  check(design: Design): Finding[];
}

/** The unit that counts as n: the experimental unit at the level of assignment. */
export interface UnitOfAnalysis {
  levelId: string;
  name: string;
  /** Number of these units in the study. */
  total: number;
  /** Units in the smallest arm, when units are split between arms (absent in a cross-over). */
  perArm?: number;
}

export interface Recommendation {
  method: NonNullable<Analysis['method']>;
  /** Standard model notation, e.g. 'log(reaction_time) ~ schedule + period + (1 | volunteer)'. */
  model: string;
  family?: NonNullable<Analysis['glmFamily']>;
  link?: 'identity' | 'logit' | 'log';
  standardErrors?: Analysis['standardErrors'];
  dfMethod: Analysis['dfMethod'];
  /** Further parts of the analysis in words: ANCOVA on baseline, log scale, splines, robust SEs, multiplicity. */
  adjustments: string[];
  /** Absent while the structure has no levels. */
  unitOfAnalysis?: UnitOfAnalysis;
  /** Level ids that get a random intercept. */
  randomIntercepts: string[];
  /** The analysis-plan fields that carry out this recommendation (merge into `design.analysis`). */
  analysisPatch: Partial<Analysis>;
  explanation: string;
  citations: Citation[];
}

export interface CheckResult {
  /** Sorted blocker → warning → advice, then in the registry's order. */
  findings: Finding[];
  recommendation: Recommendation;
}
