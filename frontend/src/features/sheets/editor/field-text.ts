/** How the kinds' editors read a cell's fields into their inputs and back. */

/** A field as the text of an input: a string as it is, nothing as empty, anything else as written. */
export const fieldText = (v: unknown) => (typeof v === 'string' ? v : v === undefined || v === null ? '' : String(v));

/** An input's text as a whole number where it is one (a count of points), else the text, refused later with a sentence. */
export const wholeNumberOrText = (s: string): number | string => (/^\s*\d+\s*$/.test(s) ? Number(s) : s);
