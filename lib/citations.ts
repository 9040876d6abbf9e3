/**
 * The bibliography: every published method the app names — in the checks (lib/rules), the
 * calculations and their methods (lib/stats), the estimators and the stress test (lib/models,
 * lib/sim), the Plan and the pages — is one constant here; text that names a source takes its
 * words from the constant (`c.short` in brackets, `narrative(c)` for "Hayes & Bennett (1999)")
 * instead of restating them. A leaf: it imports nothing of the app, so every layer may import it.
 *
 * `full` keeps what PRODUCT.md gives (its note: titles from memory, verify details before
 * citing); nothing is added except the titles of three books PRODUCT.md names without one (the
 * Fleiss, Levin & Paik title is from memory). The group after it is outside PRODUCT.md's list:
 * three standard references the list has no entry for (multiplicity, GLM families,
 * extrapolation). Verify all of them before a reference list is exported.
 */
/** `short` as cited in text ('Kish 1965'); `full` the reference as PRODUCT.md gives it. */
export interface Citation {
  short: string;
  full: string;
}

const cite = (short: string, full: string): Citation => ({ short, full });

export const KISH_1965 = cite('Kish 1965', 'Kish (1965). Survey Sampling.');
export const ELDRIDGE_2006 = cite('Eldridge, Ashby & Kerry 2006', 'Eldridge, Ashby & Kerry (2006). Int J Epidemiol 35:1292.');
export const DONNER_KLAR_2000 = cite('Donner & Klar 2000', 'Donner & Klar (2000). Design and Analysis of Cluster Randomization Trials in Health Research.');
export const HAYES_MOULTON_2017 = cite('Hayes & Moulton 2017', 'Hayes & Moulton (2017). Cluster Randomised Trials (2nd ed.).');
export const RAUDENBUSH_1997 = cite('Raudenbush 1997', 'Raudenbush (1997). Psychol Methods 2:173.');
export const HURLBERT_1984 = cite('Hurlbert 1984', 'Hurlbert (1984). Ecol Monogr 54:187.');
export const LAZIC_2010 = cite('Lazic 2010', 'Lazic (2010). BMC Neurosci 11:5.');
export const FRISON_POCOCK_1992 = cite('Frison & Pocock 1992', 'Frison & Pocock (1992). Stat Med 11:1685.');
export const VICKERS_ALTMAN_2001 = cite('Vickers & Altman 2001', 'Vickers & Altman (2001). BMJ 323:1123.');
export const DIGGLE_2002 = cite('Diggle et al. 2002', 'Diggle, Heagerty, Liang & Zeger (2002). Analysis of Longitudinal Data (2nd ed.).');
export const FLEISS_2003 = cite('Fleiss, Levin & Paik 2003', 'Fleiss, Levin & Paik (2003). Statistical Methods for Rates and Proportions (3rd ed.).');
export const MORRIS_2019 = cite('Morris, White & Crowther 2019', 'Morris, White & Crowther (2019). Stat Med 38:2074.');
export const MACKINNON_WHITE_1985 = cite('MacKinnon & White 1985', 'MacKinnon & White (1985).');
export const BELL_MCCAFFREY_2002 = cite('Bell & McCaffrey 2002', 'Bell & McCaffrey (2002).');
export const PUSTEJOVSKY_TIPTON_2018 = cite('Pustejovsky & Tipton 2018', 'Pustejovsky & Tipton (2018).');
export const BATES_2015 = cite('Bates et al. 2015', 'Bates, Mächler, Bolker & Walker (2015). J Stat Softw 67(1).');
export const SATTERTHWAITE_1946 = cite('Satterthwaite 1946', 'Satterthwaite (1946).');
export const KENWARD_ROGER_1997 = cite('Kenward & Roger 1997', 'Kenward & Roger (1997). Biometrics 53:983.');
export const LIANG_ZEGER_1986 = cite('Liang & Zeger 1986', 'Liang & Zeger (1986). Biometrika 73:13.');
export const HUBER_1964 = cite('Huber 1964', 'Huber (1964). Ann Math Stat 35:73.');
export const SENN_2002 = cite('Senn 2002', 'Senn (2002). Cross-over Trials in Clinical Research (2nd ed.).');
export const SPIRIT_2013 = cite('SPIRIT 2013', 'SPIRIT 2013 statement, item 14 (sample size).');
export const CONSORT_CLUSTER_2010 = cite('CONSORT 2010 cluster extension', "CONSORT 2010 statement: extension to cluster randomised trials, item 7a.");

// Outside PRODUCT.md's list (standard references for points the list does not cover).
export const HOLM_1979 = cite('Holm 1979', 'Holm (1979). A simple sequentially rejective multiple test procedure. Scand J Statist 6:65.');
export const MCCULLAGH_NELDER_1989 = cite('McCullagh & Nelder 1989', 'McCullagh & Nelder (1989). Generalized Linear Models (2nd ed.).');
export const GELMAN_HILL_2007 = cite('Gelman & Hill 2007', 'Gelman & Hill (2007). Data Analysis Using Regression and Multilevel/Hierarchical Models.');

/** The citation as the subject of a sentence: "Hayes & Bennett (1999)" for short "Hayes & Bennett 1999". */
export function narrative(c: Citation): string {
  return c.short.replace(/ (\d{4})$/, ' ($1)');
}

/** Citations in first-seen order, each once. */
export function uniqueCitations(list: readonly Citation[]): Citation[] {
  const seen = new Set<string>();
  return list.filter((c) => (seen.has(c.short) ? false : (seen.add(c.short), true)));
}

// Appended for the analytic calculations (lib/stats/calculations). Title from PRODUCT.md; the
// publisher is from memory: verify before export.
export const COHEN_1988 = cite(
  'Cohen 1988',
  'Cohen (1988). Statistical Power Analysis for the Behavioral Sciences (2nd ed.). Hillsdale, NJ: Lawrence Erlbaum.',
);

// Appended for the count (event-rate) calculations. Hayes & Bennett: title, journal, volume and
// first page checked against the PubMed record (Int J Epidemiol 1999;28(2):319–26). Zhu & Lakkis:
// authors, year and journal as public implementations cite them; volume and page from memory.
export const HAYES_BENNETT_1999 = cite(
  'Hayes & Bennett 1999',
  'Hayes & Bennett (1999). Simple sample size calculation for cluster-randomized trials. Int J Epidemiol 28:319.',
);
export const ZHU_LAKKIS_2014 = cite('Zhu & Lakkis 2014', 'Zhu & Lakkis (2014). Sample size calculation for comparing two negative binomial rates. Stat Med 33:376.');

// Appended for the check of levels with few units (lib/rules/few-units.ts). Title and article
// number as the journal's page gives them (peerj.com/articles/12794); author, year and volume from
// memory: verify before export.
export const GOMES_2022 = cite(
  'Gomes 2022',
  'Gomes (2022). Should I use fixed effects or random effects when I have fewer than five levels of a grouping factor in a mixed-effects model? PeerJ 10:e12794.',
);

// Appended for the stress-test verdicts (lib/sim/verdict.ts): the "liberal criterion", a rate of
// false positives between 0.5α and 1.5α counts as robust. Author, year, journal, volume and pages
// as the issue gives them; title from memory: verify before export.
export const BRADLEY_1978 = cite('Bradley 1978', 'Bradley (1978). Robustness? Br J Math Stat Psychol 31:144–152.');
