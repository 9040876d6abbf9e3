/**
 * Small helpers that turn a design's names and numbers into the findings' sentences:
 * "20 classrooms", "about 103 pupils", "37%". English only; plurals cover regular nouns and the
 * irregular ones a study design is likely to name.
 */
import type { Level } from '@/lib/design/schema';
import { capitalise, formatCount, formatDecimal, formatPercent, pluralWord } from '@/lib/format';

/** Lower-case the first letter unless the word looks like an acronym ("GP practice" stays). */
function lowerFirst(s: string): string {
  return s.length > 1 && s[1] === s[1]!.toLowerCase() ? s[0]!.toLowerCase() + s.slice(1) : s;
}

export { pluralWord };

/** A level's name as a noun in running text, singular or plural (the last word is pluralised). */
export function noun(level: Level, plural = false): string {
  const name = lowerFirst(level.name.trim());
  if (!plural) return name;
  const i = name.lastIndexOf(' ');
  return i < 0 ? pluralWord(name) : name.slice(0, i + 1) + pluralWord(name.slice(i + 1));
}

/** "20 classrooms", "1 classroom", "about 12.5 pupils" (non-whole counts come from totals given per study). */
export function count(n: number, level: Level): string {
  return `${num(n)} ${noun(level, Math.round(n * 10) / 10 !== 1)}`;
}

/** A count or quantity in text: whole numbers with thousands separators, otherwise "about" (lib/format.ts). */
export const num = formatCount;

/** A quantity rounded to `digits` decimals, trailing zeros dropped ("4.8", "0.15"; lib/format.ts). */
export function dec(x: number, digits = 1): string {
  return formatDecimal(x, digits);
}

/** A proportion as a percentage: "37%", "4.9%" below 10% (lib/format.ts). */
export function pct(p: number): string {
  return formatPercent(p, 'text');
}

/** Capitalise the first letter of a sentence. */
export const cap = capitalise;

/** "a, b and c". */
export function list(items: readonly string[]): string {
  if (items.length <= 1) return items.join('');
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}

/** A design name as a model identifier: 'Reading score' → 'reading_score', 'baseline-score' → 'baseline_score'. */
export function identifier(s: string | undefined, fallback: string): string {
  const id = (s ?? '')
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '_')
    .replace(/^_+|_+$/g, '');
  if (id.length === 0) return fallback;
  return /^[0-9]/.test(id) ? `x_${id}` : id;
}

/** Drop undefined entries so `numbers` holds only quantities that were computed; −0 becomes 0. */
export function numbers(entries: Record<string, number | undefined>): Record<string, number> {
  const out: Record<string, number> = {};
  for (const [k, v] of Object.entries(entries)) if (v !== undefined) out[k] = v === 0 ? 0 : v; // −0 does not survive JSON
  return out;
}

/** The sentence that defers judgement to a statistician; used where a finding needs judgement. */
export const ASK_STATISTICIAN = 'Agree the final choice with a qualified statistician before the protocol is fixed.';
