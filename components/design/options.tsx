import { optionsOf } from '@/lib/design/fields';

/** The `<option>`s of a select, from a table of the design's choices in words (lib/design/fields.ts). */
export function Options<K extends string>({ words }: { words: Record<K, string> }) {
  return (
    <>
      {optionsOf(words).map(([value, text]) => (
        <option key={value} value={value}>
          {text}
        </option>
      ))}
    </>
  );
}
