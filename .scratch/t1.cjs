const { create, all } = require('mathjs');
const math = create(all, { number: 'number' });
try { console.log('bcast', math.add([[1],[2]], [[1,2,3]]).toString()); } catch (e) { console.log('bcast err', e.message); }
try { console.log('mult outer', math.size(math.multiply([[1],[2]], [[1,2,3]]))); } catch (e) { console.log(e.message); }
const orig = math.range;
math.import({ range: (...a) => { console.log('range called', a); return orig(...a); } }, { override: true });
console.log(math.evaluate('size(1:5)').toString());
console.log(math.evaluate('size(range("1:5"))').toString());
const sc = new Map(); sc.set('a', math.matrix([1,2,3]));
try { math.evaluate('a.resize([1])', sc); console.log('a now', sc.get('a').toString()); } catch (e) { console.log('method err', e.message); }
console.log(Object.keys(math).length);
