/** The cautions every calculation view and package carries (PRODUCT.md, Cautions): one wording everywhere. */
export const CAUTION_TEXT =
  'Results are for use by qualified engineers. Check them independently before relying on them; locally adopted electrical codes and licensed practice take precedence, and the engineer of record remains responsible.';

/** The short form for a page footer. */
export const CAUTION_SHORT = 'For qualified engineers; check independently; local codes and licensed practice prevail.';
