// The words and figures of an uncertainty as the app and the issued PDF show them, from the
// engine's UncertaintyResult: the standard uncertainty of an input, or the budget of a propagated
// result (JCGM 100:2008 "GUM" 5.1.3 and 7.2; Monte Carlo per JCGM 101:2008). Uncertainties are
// written with two significant digits (GUM 7.2.6).
import { formatSignificantText } from './format';
import type { MonteCarloSummary, UncertaintyResult } from './types';
import { unitLabel } from './unit-label';

const withUnit = (n: number, unit: string | null, sig = 2) => {
  const u = unitLabel(unit);
  return `${formatSignificantText(n, sig)}${u ? ` ${u}` : ''}`;
};

/** "standard uncertainty u = 0.50 MeV" for an input. */
export function standardUncertaintyText(u: UncertaintyResult): string {
  return `standard uncertainty u = ${withUnit(u.u, u.unit)}`;
}

/** A share of the combined variance: "72.4 %"; "< 0.1 %" for the negligible. */
function shareText(share: number): string {
  if (!Number.isFinite(share)) return '—';
  const pct = share * 100;
  if (pct > 0 && pct < 0.05) return '< 0.1 %';
  return `${pct.toFixed(1)} %`;
}

export const BUDGET_COLUMNS = [
  'Input',
  'Value',
  'Standard uncertainty',
  'Sensitivity coefficient',
  'Contribution',
  'Share',
] as const;

/** One row of text per input, in the order of BUDGET_COLUMNS. */
export function budgetRows(u: UncertaintyResult): string[][] {
  return u.budget.map((b) => [b.name, b.valueText, b.uText, b.sensitivityText, b.contributionText, shareText(b.share)]);
}

/** "combined standard uncertainty u_c = 0.0006 T·m; expanded U = 0.0012 T·m (k = 2)". */
export function combinedText(u: UncertaintyResult): string {
  const correlated = u.correlations?.length
    ? `; with the correlations ${u.correlations.map((c) => `r(${c.a}, ${c.b}) = ${c.r < 0 ? '−' : ''}${Math.abs(c.r)}`).join(', ')} (the shares above are the uncorrelated parts)`
    : '';
  return `combined standard uncertainty u_c = ${withUnit(u.u, u.unit)}; expanded uncertainty U = ${withUnit(u.U, u.unit)} (k = ${u.k})${correlated}`;
}

/** The Monte Carlo summary as sentences: what was run, what it gave, whether it agrees. */
export function monteCarloLines(mc: MonteCarloSummary, unit: string | null): string[] {
  const lines = [
    `Monte Carlo propagation (JCGM 101): ${mc.trials.toLocaleString('en-US').replace(/,/g, '\u202f')} trials, seed ${mc.seed}: ${mc.text}`,
  ];
  lines.push(
    mc.agrees
      ? `Agrees with the first-order result: |y − U − low| = ${withUnit(mc.dLow, unit)} and |y + U − high| = ${withUnit(mc.dHigh, unit)}, within the tolerance ${withUnit(mc.tolerance, unit)}.`
      : `Does not agree with the first-order result: |y − U − low| = ${withUnit(mc.dLow, unit)}, |y + U − high| = ${withUnit(mc.dHigh, unit)}, tolerance ${withUnit(mc.tolerance, unit)}.`,
  );
  if (mc.outOfDomain > 0)
    lines.push(`${mc.outOfDomain} of the draws fell outside the model's domain and were left out.`);
  return lines;
}
