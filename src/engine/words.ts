/**
 * Word arguments (tier, mode, direction, method): case-insensitive, surrounding spaces ignored,
 * each word with its accepted aliases. Anything else is #VALUE! naming the accepted words.
 */
import { valueError } from './errors';

export type WordTable<W extends string> = Readonly<Record<W, readonly string[]>>;

export function makeWordReader<W extends string>(name: string, table: WordTable<W>): (text: string) => W {
  const lookup = new Map<string, W>();
  const shown: string[] = [];
  for (const word of Object.keys(table) as W[]) {
    lookup.set(word.toLowerCase(), word);
    for (const alias of table[word]) lookup.set(alias.toLowerCase(), word);
    shown.push(table[word].length ? `"${word}" (${table[word].map((a) => `"${a}"`).join(', ')})` : `"${word}"`);
  }
  const accepted = shown.join(', ');
  return (text: string): W => {
    const found = lookup.get(text.trim().toLowerCase());
    if (found === undefined) throw valueError(`${name} must be one of ${accepted} (got "${text}")`);
    return found;
  };
}
