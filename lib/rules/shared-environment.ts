/**
 * Treatment applied to a shared environment (cage, tank, tray, pot, classroom): the shared unit,
 * not the animals, plants or pupils in it, is the experimental unit.
 *
 * Triggers: a level marked as a shared environment (or of type cage, tank, tray, pot or
 * classroom) that holds several units, and
 * - is the level of assignment: warning unless the analysis accounts for it (then advice);
 * - lies above the level of assignment (units assigned individually inside shared
 *   environments): advice to check how the treatment is delivered.
 * Silent while the assignment level is missing. Source: Hurlbert 1984 (the experimental unit is
 * the unit to which a treatment is independently applied); Lazic 2010.
 */
import { HURLBERT_1984, LAZIC_2010 } from '@/lib/citations';
import { accountsFor, designFacts, unitsPerArm } from '@/lib/design/facts';
import { modelPlan } from './model';
import { assignedVerb, clusterSummaries, treatmentName, unitsWithArms } from './phrases';
import { cap, count, noun, num, numbers } from './text';
import type { Finding, Rule } from './types';
import type { Level } from '@/lib/design/schema';

const ID = 'shared-environment';

const SHARED_TYPES = new Set(['cage', 'tank', 'tray', 'pot', 'classroom']);

const SHARES: Partial<Record<NonNullable<Level['groupingType']>, string>> = {
  tray: 'its substrate, watering, light and position',
  pot: 'its soil, watering, light and position',
  cage: 'its food, water, bedding, handling and each other',
  tank: 'its water, temperature, feeding and each other',
  classroom: 'their teacher, their lessons and each other',
};

/** How a treatment given to one unit can reach the others in the same environment. */
function channels(type: Level['groupingType'], units: string): string {
  switch (type) {
    case 'classroom':
      return `the teacher, the lessons or talk between ${units}`;
    case 'tray':
    case 'pot':
      return 'watering, the substrate, light or position';
    case 'cage':
    case 'tank':
      return `food, water, air, temperature or contact between ${units}`;
    default:
      return `food, water, air, light, temperature, staff or contact between ${units}`;
  }
}

export const sharedEnvironment: Rule = {
  id: ID,
  title: 'Treatment applied to a shared environment',
  severity: 'warning',
  check(design) {
    const f = designFacts(design);
    const A = f.assignment;
    if (!A || !f.eu) return [];
    const out: Finding[] = [];
    for (const L of f.levels) {
      const shared = L.level.sharedEnvironment || (L.level.groupingType !== undefined && SHARED_TYPES.has(L.level.groupingType));
      if (!shared || !L.groupsObservations) continue;
      const child = f.levels[L.index + 1]!;
      const what = (L.level.groupingType && SHARES[L.level.groupingType]) ?? 'the same environment and each other';
      const model = modelPlan(design).formula;
      if (L.index === f.eu.index && !f.withinUnit) {
        const handled = f.planGiven && accountsFor(f, L);
        const perArm = unitsPerArm(f);
        out.push({
          ruleId: ID,
          key: L.level.id,
          severity: handled ? 'advice' : 'warning',
          title: `The ${noun(L.level)} is the experimental unit`,
          found: `${cap(treatmentName(design))} ${assignedVerb(design)} to whole ${noun(L.level, true)}, and the ${num(child.perParent)} ${noun(child.level, true)} of a ${noun(L.level)} share ${what}.`,
          why:
            `When a treatment is applied to a shared environment, that environment is the experimental unit: the ${unitsWithArms(f, L, perArm)} are the independent replicates of the comparison, whatever number of ${noun(child.level, true)} they hold (${HURLBERT_1984.short}). ` +
            `Anything else that happens to one ${noun(L.level)} affects all its ${noun(child.level, true)} at once and cannot be told apart from the treatment except by comparing ${noun(L.level, true)}.`,
          todo: handled
            ? `The plan accounts for this. Plan the number of ${noun(L.level, true)}, not of ${noun(child.level, true)}, and keep ${noun(L.level, true)} in the same conditions apart from the treatment.`
            : `Count ${noun(L.level, true)} as n: analyse ${noun(L.level)} ${clusterSummaries(design)} or use a random intercept for ${noun(L.level)} (\`${model}\`), and plan the number of ${noun(L.level, true)} from the design effect.`,
          model,
          numbers: numbers({ experimentalUnits: L.total, unitsPerArm: perArm, unitsInside: child.perParent, observations: f.totalObs }),
          citations: [HURLBERT_1984, LAZIC_2010],
          levelIds: [L.level.id],
        });
      } else if (L.index < A.index && L.index < f.eu.index) {
        out.push({
          ruleId: ID,
          key: L.level.id,
          severity: 'advice',
          title: `${cap(noun(A.level, true))} assigned individually inside shared ${noun(L.level, true)}`,
          found: `${cap(treatmentName(design))} ${assignedVerb(design)} to individual ${noun(A.level, true)}, but they are grouped in ${count(L.total, L.level)}: the ${noun(child.level, true)} of one ${noun(L.level)} share ${what}.`,
          why:
            `If the treatment reaches the whole ${noun(L.level)} — through ${channels(L.level.groupingType, noun(child.level, true))} — then the ${noun(L.level)}, not the ${noun(A.level)}, is the experimental unit and the design is in effect assigned per ${noun(L.level)} (${HURLBERT_1984.short}). ` +
            `If it does not, ${noun(A.level, true)} in one ${noun(L.level)} are still correlated.`,
          todo: `State how the treatment is delivered. If it can spread within a ${noun(L.level)}, assign whole ${noun(L.level, true)}; if not, give ${noun(L.level)} a random intercept (\`${model}\`).`,
          model,
          numbers: numbers({ sharedUnits: L.total, unitsInside: child.perParent }),
          citations: [HURLBERT_1984, LAZIC_2010],
          levelIds: [L.level.id, A.level.id],
        });
      }
    }
    return out;
  },
};
