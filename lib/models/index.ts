/**
 * The analyses of lib/models by name: `analyse('cluster-robust', data, fixed)` fits one and
 * returns the estimate, SE and df of the effect of interest (see each file for its formula,
 * source and reference fits).
 *
 *   ols             ols.ts            OLS, model-based SE
 *   ols-hc3         hc3.ts            OLS, HC3 SE (MacKinnon & White 1985)
 *   cluster-robust  cr2.ts            OLS, CR2 SE with Satterthwaite df (Bell & McCaffrey 2002;
 *                                     Pustejovsky & Tipton 2018)
 *   cluster-means   cluster-means.ts  OLS on cluster means (or per-cluster slopes), df = G − p
 *   mixed           mixed.ts          linear mixed model by REML
 *   huber           huber.ts          Huber M-estimation, sandwich SE (Huber 1964)
 *   log-ols         log-ols.ts        OLS on log y; the effect is a log ratio
 *   glm             glm.ts            logistic or Poisson regression, z test
 *   glm-nb          glm-nb.ts         negative-binomial regression (log link), z test
 *   glmm            glmm.ts           logistic or Poisson GLMM with a random intercept (Laplace
 *                                     or adaptive quadrature), z test
 *   period-difference  period-difference.ts  AB/BA cross-over: t test on the period differences
 *
 * The functions reuse module-level buffers: call them from one thread at a time per module
 * instance (each worker thread has its own), and copy a result before the next call only if you
 * keep references into it (EffectEstimate itself is a fresh object).
 */
import { fitClusterMeans, type ClusterMeansOptions } from './cluster-means';
import { fitClusterRobust, type Cr2Options } from './cr2';
import { fitGlm, type GlmOptions } from './glm';
import { fitGlmNb, type GlmNbOptions } from './glm-nb';
import { fitGlmm, type GlmmOptions } from './glmm';
import { fitOlsHc3, type Hc3Options } from './hc3';
import { fitHuber, type HuberOptions } from './huber';
import { fitLogOls } from './log-ols';
import { fitMixed, type MixedOptions } from './mixed';
import { fitOls, type OlsOptions } from './ols';
import { fitPeriodDifference, type PeriodDifferenceOptions } from './period-difference';
import type { AnalysisName, Dataset, EffectEstimate, FixedEffects } from './types';

export { fitClusterMeans, fitClusterRobust, fitGlm, fitGlmm, fitGlmNb, fitHuber, fitLogOls, fitMixed, fitOls, fitOlsHc3, fitPeriodDifference };
export type { ClusterMeansOptions, Cr2Options, GlmmOptions, GlmNbOptions, GlmOptions, Hc3Options, HuberOptions, MixedOptions, OlsOptions, PeriodDifferenceOptions };

/** The options each analysis takes. */
export interface AnalysisOptionsMap {
  ols: OlsOptions;
  'ols-hc3': Hc3Options;
  'cluster-robust': Cr2Options;
  'cluster-means': ClusterMeansOptions;
  mixed: MixedOptions;
  huber: HuberOptions;
  'log-ols': OlsOptions;
  glm: GlmOptions;
  'glm-nb': GlmNbOptions;
  glmm: GlmmOptions;
  'period-difference': PeriodDifferenceOptions;
}

/** Options of any analysis, for callers that pass one options object to several analyses. */
export type AnalysisOptions = Partial<
  OlsOptions & Hc3Options & Cr2Options & ClusterMeansOptions & MixedOptions & HuberOptions & GlmOptions & GlmNbOptions & GlmmOptions & PeriodDifferenceOptions
>;

const FITS: { [K in AnalysisName]: (data: Dataset, fixed: FixedEffects, options?: AnalysisOptionsMap[K]) => EffectEstimate } = {
  ols: fitOls,
  'ols-hc3': fitOlsHc3,
  'cluster-robust': fitClusterRobust,
  'cluster-means': fitClusterMeans,
  mixed: fitMixed,
  huber: fitHuber,
  'log-ols': fitLogOls,
  glm: fitGlm,
  'glm-nb': fitGlmNb,
  glmm: fitGlmm,
  'period-difference': fitPeriodDifference,
};

/** Fits the analysis `name` to `data`; see the file of each analysis for what it throws. */
export function analyse<K extends AnalysisName>(
  name: K,
  data: Dataset,
  fixed: FixedEffects,
  options?: AnalysisOptionsMap[K],
): EffectEstimate {
  const fit = FITS[name] as (data: Dataset, fixed: FixedEffects, options?: AnalysisOptionsMap[K]) => EffectEstimate;
  if (!fit) throw new RangeError(`unknown analysis "${String(name)}"`);
  return fit(data, fixed, options);
}
