// The evaluating half of `npm run calc` (calc.mjs forks it with a heap cap and stops it at a deadline):
// evaluates the sheet it is sent and answers with the contract's JSON and exit status.
const engine = require(process.argv[2]);

process.once('message', (sheet) => {
  let result;
  try {
    result = engine.toContractJson(engine.evaluateSheet(sheet));
  } catch (err) {
    result = { error: err.message };
  }
  process.send(result, () => process.disconnect());
});
