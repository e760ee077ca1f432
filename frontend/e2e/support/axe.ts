/** axe-core (4.14.1, Deque's accessibility engine) run in the page as its own script, against WCAG 2.1 A and AA. */
import { createRequire } from 'node:module';
import { readFileSync } from 'node:fs';
import type { Page } from 'playwright-core';

const AXE = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8');

interface Violation {
  id: string;
  impact: string | null;
  help: string;
  nodes: { target: string[]; html: string; failureSummary?: string }[];
}

/** The serious and critical violations on the page as it stands, each as "rule: where". */
export async function seriousViolations(page: Page): Promise<string[]> {
  // Through the browser's debugging protocol, so the page's Content Security Policy (no inline script) stays as it is.
  await page.evaluate(`${AXE}\n;true`);
  const violations = await page.evaluate(async () => {
    const axe = (window as unknown as { axe: { run: (context: Document, options: object) => Promise<{ violations: Violation[] }> } }).axe;
    const result = await axe.run(document, { runOnly: { type: 'tag', values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'] }, resultTypes: ['violations'] });
    return result.violations;
  });
  return violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map(
      (v) => `${v.id} (${v.impact}): ${v.help} — ${v.nodes.map((n) => `${n.target.join(' ')} ${n.html.slice(0, 120)} ${n.failureSummary ?? ''}`).join(' | ')}`,
    );
}
