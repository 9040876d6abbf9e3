import type { CalculationOutput } from '@/lib/stats/calculations/types';
import { formatValue, labelOf } from './format';

/**
 * Where an input of a calculation came from: the design's sources (a pilot, the literature, an
 * expert's judgement, a guess with no source), the design itself (its structure, or computed from
 * it), a test setting, or a value typed on this page.
 */
export type InputOrigin = 'design' | 'pilot' | 'published' | 'expert' | 'none' | 'setting' | 'entered';

/** The groups in the order shown: the firmest ground first, the guesses last. */
const GROUPS: { origin: InputOrigin; title: string; tone: string }[] = [
  { origin: 'design', title: 'From the design', tone: 'border-brand' },
  { origin: 'pilot', title: 'From a pilot study', tone: 'border-ok' },
  { origin: 'published', title: 'From the literature', tone: 'border-ok' },
  { origin: 'setting', title: 'Test settings', tone: 'border-brand' },
  { origin: 'entered', title: 'Entered here', tone: 'border-line' },
  { origin: 'expert', title: 'An informed guess', tone: 'border-caution' },
  { origin: 'none', title: 'A guess with no source yet', tone: 'border-caution' },
];

/** The inputs that are test settings rather than assumptions about the data. */
export const SETTING_KEYS: ReadonlySet<string> = new Set(['alpha', 'power', 'targetPower', 'sides', 'outcomes', 'multiplicity', 'dropout']);

/** The inputs grouped by origin, in the order of GROUPS; an input with no known origin is a setting or entered here. */
export function groupByOrigin(keys: readonly string[], origins: Partial<Record<string, InputOrigin>>): { origin: InputOrigin; title: string; tone: string; keys: string[] }[] {
  const originOf = (k: string): InputOrigin => origins[k] ?? (SETTING_KEYS.has(k) ? 'setting' : 'entered');
  return GROUPS.map((g) => ({ ...g, keys: keys.filter((k) => originOf(k) === g.origin) })).filter((g) => g.keys.length > 0);
}

/** The inputs of a calculation by where they came from, each named in words (no symbols). */
export function ProvenanceView({ keys, output, origins, heading: Heading }: { keys: string[]; output: CalculationOutput; origins: Partial<Record<string, InputOrigin>>; heading: 'h3' | 'h4' }) {
  const groups = groupByOrigin(keys, origins);
  return (
    <div className="space-y-2" data-testid="inputs-by-origin">
      <Heading className="text-sm font-bold">Where the inputs came from</Heading>
      <div className="grid gap-2 sm:grid-cols-2">
        {groups.map((g) => (
          <div key={g.origin} className={`rounded-md border-l-4 bg-white px-3 py-2 ${g.tone}`} data-origin={g.origin}>
            <p className="text-xs font-semibold uppercase tracking-wide text-muted">{g.title}</p>
            <ul className="mt-1 space-y-0.5 text-sm">
              {g.keys.map((k) => (
                <li key={k} className="flex flex-wrap justify-between gap-x-3">
                  <span>{labelOf(k)}</span>
                  <span className="font-semibold tabular-nums">{formatValue(k, output.result[k])}</span>
                </li>
              ))}
            </ul>
          </div>
        ))}
      </div>
    </div>
  );
}
