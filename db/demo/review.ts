/**
 * The review in progress on the demo's classroom study (issue 12): the consultant's thread on the
 * unit-of-analysis finding, still open, with the owner's reply; a thread on the classroom ICC,
 * answered and resolved; and the consultant's suggestion to adjust for the baseline reading
 * score, waiting for the owner. Invented, like the rest of the demo. A mention is written
 * `@{e-mail}` here and stored as the member's id.
 */
import type { ThreadAnchor } from '@/lib/validation/review';

export interface DemoThread {
  anchor: ThreadAnchor;
  comments: { by: string; text: string }[];
  resolvedBy?: string;
}

export interface DemoSuggestion {
  by: string;
  path: string;
  value: string | number | boolean | null;
  reason: string;
}

export interface DemoReview {
  threads: DemoThread[];
  suggestions: DemoSuggestion[];
}

const PRIYA = 'priya.nair@harrowvale.example';
const TOM = 'tom.okafor@harrowvale.example';
const LENA = 'lena.vogel@harrowvale.example';

export const CLASSROOM_REVIEW: DemoReview = {
  threads: [
    {
      anchor: { kind: 'finding', ruleId: 'unit-of-analysis', key: 'classroom' },
      comments: [
        {
          by: LENA,
          text: `@{${PRIYA}} the programme is given to whole classrooms, so the classroom is the unit that counts: 20 classrooms, not 500 pupils. Please plan a mixed model with a random intercept for classroom before we size the study.`,
        },
        { by: PRIYA, text: `Agreed. @{${TOM}} could you switch the analysis plan, and check on the Plan tab whether 20 classrooms are still enough?` },
      ],
    },
    {
      anchor: { kind: 'field', path: 'assumptions.iccs[classroom].value' },
      comments: [
        { by: LENA, text: 'Where does the classroom ICC of 0.15 come from? It drives the design effect more than anything else here.' },
        { by: PRIYA, text: 'From the regional reading-test report (classroom ICCs for the same age group); the source is noted with the value.' },
        { by: LENA, text: 'Thank you, that is a sound source for this age group.' },
      ],
      resolvedBy: LENA,
    },
  ],
  suggestions: [
    {
      by: LENA,
      path: 'analysis.adjustsForBaseline',
      value: true,
      reason: 'Reading is measured at the start of the year too. Adjusting for that baseline score narrows the confidence interval of the programme effect, at no cost in classrooms.',
    },
  ],
};
