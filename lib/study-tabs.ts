/**
 * The tabs of a study, in the product's order. A tab whose capability is not built yet says so
 * on its page, with what it will do; it never shows sample numbers.
 */
export interface StudyTab {
  slug: string;
  label: string;
  summary: string;
  built: boolean;
}

export const STUDY_TABS: StudyTab[] = [
  { slug: 'design', label: 'Design', built: true, summary: 'A step-by-step description of the design — outcome, levels from top to bottom, assignment, occasions, assumptions with their sources and the analysis plan — with a live diagram of the hierarchy.' },
  { slug: 'checks', label: 'Checks', built: true, summary: 'Findings about the design — where measurements are not independent, what that does to the false-positive rate, and which analysis the design calls for — each with its reasoning and a citation.' },
  { slug: 'plan', label: 'Plan', built: true, summary: 'Sample size, power or smallest detectable effect for this design, accounting for clustering, repeated measures, attrition and several outcomes, with sensitivity plots.' },
  { slug: 'stress-test', label: 'Stress test', built: true, summary: 'Simulations of power, false-positive rate and confidence-interval coverage of several analyses when the data break each assumption.' },
  { slug: 'pilot-data', label: 'Pilot data', built: false, summary: 'Upload pilot data as CSV to estimate variance components and ICCs, and apply them to the design.' },
  { slug: 'review', label: 'Review', built: true, summary: 'Comment threads on any part of the design, its findings and results, suggested changes, sign-off of a version, version history and comparison, and e-mail notifications.' },
  { slug: 'justification', label: 'Justification', built: false, summary: 'The sample-size justification for a grant or protocol, exported as DOCX, PDF and Markdown, with figures, references and a reproducibility appendix.' },
];

export function findTab(slug: string): StudyTab | undefined {
  return STUDY_TABS.find((t) => t.slug === slug);
}
