/**
 * Revision codes: the first issued revision of a sheet is A, then B, … Z, then AA, AB, … (as columns
 * are lettered). A draft being prepared for the next issue is shown as that code with "draft".
 * Letters for issued revisions follow common practice for drawing and document revisions.
 */
export function revisionCode(n: number): string {
  if (!Number.isInteger(n) || n < 1) throw new RangeError('a revision number is a whole number from 1');
  let code = '';
  for (let k = n; k > 0; k = Math.floor((k - 1) / 26)) code = String.fromCharCode(65 + ((k - 1) % 26)) + code;
  return code;
}

/** JSON with object keys sorted at every level: the canonical form whose SHA-256 identifies a snapshot. */
export function canonicalJson(value: unknown): string {
  const canon = (v: unknown): unknown => {
    if (Array.isArray(v)) return v.map(canon);
    if (v && typeof v === 'object') {
      const o = v as Record<string, unknown>;
      return Object.fromEntries(
        Object.keys(o)
          .filter((k) => o[k] !== undefined)
          .sort()
          .map((k) => [k, canon(o[k])]),
      );
    }
    return v;
  };
  return JSON.stringify(canon(value));
}
