import katex from 'katex';
const h = katex.renderToString(process.argv[2], { throwOnError: false, strict: 'ignore', trust: false, maxSize: 20, maxExpand: 200 });
console.log(h.match(/(height|width|border[a-z-]*):\s*[\d.]{3,}em/g));
