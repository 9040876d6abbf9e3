/**
 * Leaf: how every number, percentage, plural and date reaches a reader. One locale (en-GB: "1,500",
 * "3 Dec 2026") and one time zone (UTC, written after each time so that nobody reads it as their own),
 * on the server and in the browser alike, so a page renders the same text in both. Built on
 * Intl.NumberFormat, Intl.PluralRules and Intl.DateTimeFormat; imports nothing of the app, so the
 * engine (lib/stats, lib/sim), the checks and the components share it.
 *
 * Every number here is for reading: a negative one carries the minus sign U+2212 ("−0.3567"), not
 * the hyphen Intl writes. None of these feeds an input, a CSV or an API value: those take the
 * number itself (String(x), JSON), which stays machine-readable.
 */

export const LOCALE = 'en-GB';
export const TIME_ZONE = 'UTC';

const WHOLE = new Intl.NumberFormat(LOCALE, { maximumFractionDigits: 0 });
const ONE_DECIMAL = new Intl.NumberFormat(LOCALE, { maximumFractionDigits: 1 });
const PLURAL = new Intl.PluralRules(LOCALE);

/** The minus sign U+2212, for the hyphen-minus in a formatted number ("-0.36" → "−0.36", "1e-5" → "1e−5"). */
export const MINUS = '\u2212';
const minus = (text: string) => text.replace(/-/g, MINUS);

/** Significant digits of a figure quoted in a calculation's sentence (its warnings, its method): "0.0166667". */
export const SENTENCE_DIGITS = 6;

/** "1,500"; a number that is not whole to `digits` significant digits ("0.1235", "−0.3567"); "—" when not finite. */
export function formatNumber(value: number, digits = 4): string {
  if (!Number.isFinite(value)) return '—';
  if (Number.isInteger(value)) return minus(WHOLE.format(value));
  const abs = Math.abs(value);
  if (abs !== 0 && (abs < 1e-4 || abs >= 1e9)) return minus(value.toExponential(digits - 1).replace(/\.?0+e/, 'e'));
  return minus(new Intl.NumberFormat(LOCALE, { maximumSignificantDigits: digits }).format(value));
}

/** `value` to at most `digits` decimals, trailing zeros dropped: "4.8", "0.15", "1,234.5", "−0.25". */
export function formatDecimal(value: number, digits = 1): string {
  if (!Number.isFinite(value)) return '—';
  return minus(new Intl.NumberFormat(LOCALE, { maximumFractionDigits: digits }).format(value));
}

/** A count in running text: "1,500"; "about 12.5" (one decimal, none from 100 up) when it is not whole. */
export function formatCount(n: number): string {
  const r = Math.round(n);
  if (Math.abs(n - r) < 1e-9) return minus(WHOLE.format(r));
  return `about ${minus(Math.abs(n) >= 100 ? WHOLE.format(r) : ONE_DECIMAL.format(n))}`;
}

/**
 * A proportion as a percentage.
 * - `'table'` (results, calculators): one decimal ("80.0%"), two near the ends so that 99.96%
 *   never reads as 100.0% nor 0.04% as 0.0%.
 * - `'text'` (sentences): whole from 10% up ("37%"), two significant digits below ("5.1%", "0.04%").
 * "—" when the value is missing or not finite.
 */
export function formatPercent(p: number | null | undefined, style: 'table' | 'text' = 'table'): string {
  if (p === null || p === undefined || !Number.isFinite(p)) return '—';
  const x = 100 * p;
  let digits: Intl.NumberFormatOptions;
  if (style === 'text') {
    digits = x === 0 || Math.abs(x) >= 10 ? { maximumFractionDigits: 0 } : { maximumSignificantDigits: 2 };
  } else if ((x > 99.9 && x < 100) || (x > 0 && x < 0.1)) {
    return `${new Intl.NumberFormat(LOCALE, { minimumFractionDigits: 2, maximumFractionDigits: 2 }).format(Math.min(Math.max(x, 0.01), 99.99))}%`;
  } else {
    digits = { minimumFractionDigits: 1, maximumFractionDigits: 1 };
  }
  return minus(new Intl.NumberFormat(LOCALE, { style: 'percent', ...digits }).format(p));
}

/** Plurals of nouns a study design is likely to name; the rest follow the regular rules. */
const IRREGULAR: Record<string, string> = {
  leaf: 'leaves',
  calf: 'calves',
  half: 'halves',
  shelf: 'shelves',
  wolf: 'wolves',
  knife: 'knives',
  life: 'lives',
  mouse: 'mice',
  louse: 'lice',
  goose: 'geese',
  child: 'children',
  person: 'people',
  man: 'men',
  woman: 'women',
  tooth: 'teeth',
  foot: 'feet',
  ox: 'oxen',
  fish: 'fish',
  sheep: 'sheep',
  deer: 'deer',
  series: 'series',
  species: 'species',
  analysis: 'analyses',
  nucleus: 'nuclei',
  larva: 'larvae',
};

/** "classroom" → "classrooms", "person" → "people", "Tray" → "Trays": one English word in its plural. */
export function pluralWord(word: string): string {
  const irregular = IRREGULAR[word.toLowerCase()];
  if (irregular) return word[0] === word[0]!.toUpperCase() && word.length > 1 ? irregular[0]!.toUpperCase() + irregular.slice(1) : irregular;
  if (/(s|x|z|ch|sh)$/i.test(word)) return `${word}es`;
  if (/[^aeiou]y$/i.test(word)) return `${word.slice(0, -1)}ies`;
  return `${word}s`;
}

/** A noun (its last word pluralised when needed) for `n` of it: "study" / "studies" ("GP practice" → "GP practices"). */
export function nounFor(n: number, singular: string, plural?: string): string {
  if (PLURAL.select(n) === 'one') return singular;
  if (plural) return plural;
  const m = /^(.*?)(\S+)$/.exec(singular);
  return m ? (m[1] ?? '') + pluralWord(m[2] ?? '') : singular;
}

/** "1 finding", "2 findings", "1,500 studies": a count with its noun. */
export function plural(n: number, singular: string, pluralForm?: string): string {
  return `${formatCount(n)} ${nounFor(n, singular, pluralForm)}`;
}

const DATE = new Intl.DateTimeFormat(LOCALE, { day: 'numeric', month: 'short', year: 'numeric', timeZone: TIME_ZONE });
const DATE_TIME = new Intl.DateTimeFormat(LOCALE, { dateStyle: 'medium', timeStyle: 'short', timeZone: TIME_ZONE });

/** "3 Dec 2026" (the day in UTC). */
export function formatDate(when: Date | string | number): string {
  return DATE.format(new Date(when));
}

/** "3 Dec 2026, 13:45 UTC": the time says its zone. */
export function formatDateTime(when: Date | string | number): string {
  return `${DATE_TIME.format(new Date(when))} UTC`;
}

/** The text with its first letter in capitals: a sentence that starts with a name. */
export function capitalise(s: string): string {
  return s.length === 0 ? s : s[0]!.toUpperCase() + s.slice(1);
}
