/**
 * The invented demo of PRODUCT.md: a research team at the fictional Harrow Vale Institute with
 * four draft studies. All names, e-mail addresses and studies are made up.
 */
import type { DesignInput } from '@/lib/design/schema';
import type { StudyRole } from '../schema';
import { CLASSROOM_DESIGN, FALLS_DESIGN, GREENHOUSE_DESIGN, SLEEP_DESIGN } from './designs';
import { CLASSROOM_REVIEW, type DemoReview } from './review';

export const DEMO_WORKSPACE = 'Harrow Vale Institute';

export interface DemoStudy {
  title: string;
  description: string;
  members: Record<string, StudyRole>;
  design: DesignInput;
  /** Threads and suggestions of a review in progress (db/demo/review.ts). */
  review?: DemoReview;
  /** A consultant's sign-off of the first version, under a name (issue 12: a signed-off version). */
  signoff?: { by: string; versionName: string; statement: string; conditions?: string };
}

const PRIYA = 'priya.nair@harrowvale.example';
const TOM = 'tom.okafor@harrowvale.example';
const LENA = 'lena.vogel@harrowvale.example';
const SAM = 'sam.reyes@harrowvale.example';
const ADA = 'ada.brennan@harrowvale.example';

export const DEMO_ADMINS = [PRIYA];

export const DEMO_STUDIES: DemoStudy[] = [
  {
    title: 'Reading-support programme, randomised by classroom',
    description:
      'Primary-school classrooms are randomised to a reading-support programme or usual teaching; reading scores are measured on each pupil at the end of the school year. The classroom is the unit of randomisation, the pupil the unit of measurement.',
    members: { [PRIYA]: 'owner', [TOM]: 'editor', [LENA]: 'consultant', [SAM]: 'writer' },
    design: CLASSROOM_DESIGN,
    review: CLASSROOM_REVIEW,
  },
  {
    title: 'Greenhouse trial of two growing substrates',
    description:
      'Two substrates are compared in a greenhouse. Each tray holds several plants and receives one substrate; several leaves are measured on each plant. Trays, plants and leaves are nested levels.',
    members: { [PRIYA]: 'owner', [LENA]: 'consultant', [ADA]: 'viewer' },
    design: GREENHOUSE_DESIGN,
    signoff: {
      by: LENA,
      versionName: 'Sent to the funder',
      statement: 'Reviewed the design, the checks and the Plan: trays are the unit of randomisation and the sample size counts trays, not leaves.',
      conditions: 'Report the between-tray ICC and its source in the protocol.',
    },
  },
  {
    title: 'Sleep timing and next-day reaction time',
    description:
      'Volunteers follow two sleep-timing schedules; reaction time is measured on each of 8 nights per volunteer. The nights of one volunteer are repeated measures, not independent units.',
    members: { [PRIYA]: 'owner', [LENA]: 'consultant', [SAM]: 'writer' },
    design: SLEEP_DESIGN,
  },
  {
    title: 'Falls-prevention programme, randomised by care home',
    description:
      'Care homes are randomised to a falls-prevention programme (staff training, medication review, safer rooms) or usual care; falls of each resident are counted over a year of follow-up. The care home is the unit of randomisation, the resident the unit of measurement, and the outcome a count of events per resident-year.',
    members: { [PRIYA]: 'owner', [TOM]: 'editor', [LENA]: 'consultant', [ADA]: 'viewer' },
    design: FALLS_DESIGN,
  },
];
