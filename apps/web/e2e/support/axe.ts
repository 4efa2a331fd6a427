import { createRequire } from 'node:module';
import type { Page } from 'playwright-core';
import { expect } from 'vitest';

// axe-core's engine as a string, injected into the page (no network, no bundler).
const axeSource = (createRequire(import.meta.url)('axe-core') as { source: string }).source;

interface AxeViolation {
  id: string;
  impact: string | null;
  help: string;
  nodes: { target: unknown[]; failureSummary?: string }[];
}

/**
 * Runs axe-core (WCAG 2.0-2.2 A and AA rules) on the screen as it is now and fails on any
 * serious or critical violation, naming the rule and the elements. Call it once a screen is shown.
 */
export async function expectAccessible(page: Page, screen: string): Promise<void> {
  // Evaluated through the DevTools protocol: the app's Content-Security-Policy refuses inline scripts.
  if (!(await page.evaluate(() => 'axe' in window))) await page.evaluate(axeSource);
  const violations = await page.evaluate(async () => {
    const axe = (
      window as unknown as {
        axe: { run: (ctx: unknown, opts: unknown) => Promise<{ violations: AxeViolation[] }> };
      }
    ).axe;
    const result = await axe.run(document, {
      runOnly: {
        type: 'tag',
        values: ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22aa', 'best-practice'],
      },
      resultTypes: ['violations'],
    });
    return result.violations.map((v) => ({
      id: v.id,
      impact: v.impact,
      help: v.help,
      nodes: v.nodes
        .slice(0, 5)
        .map((n) => ({ target: n.target, failureSummary: n.failureSummary })),
    }));
  });
  const serious = violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
  const report = serious
    .map(
      (v) =>
        `${v.id} (${v.impact}): ${v.help}\n  ${v.nodes.map((n) => `${JSON.stringify(n.target)} ${n.failureSummary ?? ''}`).join('\n  ')}`,
    )
    .join('\n');
  expect(report, `accessibility violations on ${screen}`).toBe('');
}
