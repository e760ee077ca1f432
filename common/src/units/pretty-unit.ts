// No engine here: chart axes use it, and the browser draws charts without loading mathjs.

/** A unit in mathjs syntax ("uF", "kohm", "m/s^2") as shown to a reader ("µF", "kΩ", "m/s²"). */
export function prettyUnit(unit: string): string {
  return unit
    .replace(/\bu(?=[A-Za-zΩ])/g, 'µ')
    .replace(/ohm/g, 'Ω')
    .replace(/\^(-?\d+)/g, (_, p: string) => p.replace(/-/g, '⁻').replace(/\d/g, (c) => '⁰¹²³⁴⁵⁶⁷⁸⁹'[Number(c)]))
    .replace(/ \/ /g, '/')
    .replace(/ /g, '·')
    .replace(/^deg$/, '°')
    .replace(/^deg([CF])$/, '°$1');
}
