const { create, all } = require('mathjs');
const math = create(all, { number: 'number' });
const fns = [], consts = [];
for (const k of Object.keys(math)) { if (/^[A-Z]/.test(k) || k.endsWith('Dependencies') || k.endsWith('Transform')) continue; (typeof math[k] === 'function' ? fns : consts).push(k); }
console.log(fns.join(' ')); console.log('---'); console.log(consts.join(' '));
