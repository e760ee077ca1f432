const { evaluateSheet } = require('../common/dist/index.js');
const n = Number(process.argv[2] ?? 400);
const src = Array.from({ length: n }, (_, k) => `a_${k} = ones(100000)`).join('\n');
const t = Date.now();
try { const r = evaluateSheet({ cells: [{ kind: 'calc', source: src }] }); console.log('done', Date.now() - t, 'ms', r.cells[0].errors.slice(0, 2)); } catch (e) { console.log('threw', e.message); }
console.log('rss MB', process.memoryUsage().rss / 1e6 | 0, 'heap', process.memoryUsage().heapUsed / 1e6 | 0);
