/**
 * Worksheet names for the analyte × material sheets: at most 31 characters, none of : \ / ? * [ ],
 * not starting or ending with an apostrophe, and unique ignoring case (the rules spreadsheet
 * programs enforce; common practice, no source). A name cut or already taken gets " (2)", " (3)"…
 */
export const MAX_SHEET_NAME = 31;

function clean(name: string): string {
  const s = name.replace(/[:\\/?*[\]]/g, ' ').replace(/\s+/g, ' ').trim().replace(/^'+|'+$/g, '');
  return s === '' ? 'Sheet' : s;
}

/** Names for each group's items, in order, avoiding `reserved` and each other. */
export function sheetNames(groups: readonly (readonly string[])[], reserved: readonly string[]): string[][] {
  const taken = new Set(reserved.map((r) => r.toLowerCase()));
  return groups.map((items) =>
    items.map((item) => {
      const base = clean(item);
      let name = base.slice(0, MAX_SHEET_NAME).trim();
      for (let k = 2; taken.has(name.toLowerCase()); k++) {
        const suffix = ` (${k})`;
        name = base.slice(0, MAX_SHEET_NAME - suffix.length).trim() + suffix;
      }
      taken.add(name.toLowerCase());
      return name;
    }),
  );
}
