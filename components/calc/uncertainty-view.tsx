import type { UncertaintyResult } from '@/lib/calc/types';
import {
  BUDGET_COLUMNS,
  budgetRows,
  combinedText,
  monteCarloLines,
  standardUncertaintyText,
} from '@/lib/calc/uncertainty-text';
import { Table, Td, Th } from '@/components/ui/table';

/** The line under a value: "y ± U (k = 2)" for a result, the standard uncertainty for an input. */
export function UncertaintyValue({ uncertainty }: { uncertainty: UncertaintyResult }) {
  return (
    <p className="font-mono text-xs text-ink">
      {uncertainty.kind === 'input' ? standardUncertaintyText(uncertainty) : uncertainty.text}
    </p>
  );
}

/**
 * A propagated uncertainty's caution (when the first-order and Monte Carlo results disagree, or
 * draws fell outside the model's domain) and its budget behind a disclosure: each input's value,
 * standard uncertainty, sensitivity coefficient, contribution and share, then u_c and U, then the
 * Monte Carlo check when one was run. Same words as the issued PDF (lib/calc/uncertainty-text.ts).
 */
export function UncertaintyDetails({ uncertainty, line }: { uncertainty: UncertaintyResult; line: number }) {
  if (uncertainty.kind !== 'propagated') return null;
  const rows = budgetRows(uncertainty);
  const mc = uncertainty.monteCarlo;
  return (
    <div className="my-1 space-y-1">
      {uncertainty.warning ? (
        <p
          role="status"
          className="rounded border-l-4 border-caution-rule bg-caution-soft px-2 py-1 text-sm text-caution"
        >
          <strong>Caution:</strong> {uncertainty.warning}
        </p>
      ) : null}
      <details className="text-sm">
        <summary className="cursor-pointer text-accent underline-offset-2 hover:underline">
          Uncertainty budget<span className="sr-only"> of line {line}</span>
        </summary>
        <div className="mt-1 space-y-1">
          {rows.length ? (
            <Table
              caption="Contributions to the combined standard uncertainty (first order, JCGM 100)"
              captionClassName="bg-paper px-2 py-1 text-left font-semibold"
              className="w-full border-collapse text-xs"
              box="rounded border border-rule"
              boxLabel={`Uncertainty budget of line ${line}`}
            >
              <thead>
                <tr>
                  {BUDGET_COLUMNS.map((title, i) => (
                    <Th
                      key={title}
                      className={`border-b border-rule-strong px-2 py-1 font-semibold ${i === 0 ? 'text-left' : 'text-right'}`}
                    >
                      {title}
                    </Th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {rows.map((cells, r) => (
                  <tr key={r} className="border-t border-rule first:border-t-0">
                    {cells.map((cell, i) =>
                      i === 0 ? (
                        <Th key={i} scope="row" className="px-2 py-0.5 text-left font-mono font-normal">
                          {cell}
                        </Th>
                      ) : (
                        <Td key={i} numeric className="px-2 py-0.5 font-mono">
                          {cell}
                        </Td>
                      ),
                    )}
                  </tr>
                ))}
              </tbody>
            </Table>
          ) : null}
          <p className="text-xs">{combinedText(uncertainty)}</p>
          {uncertainty.nonLinear ? (
            <p className="text-xs text-ink-muted">
              The model is not linear over ±2u of some input; the Monte Carlo result below is the one to rely on.
            </p>
          ) : null}
          {mc ? (
            <div className="text-xs text-ink-muted">
              {monteCarloLines(mc, uncertainty.unit).map((l) => (
                <p key={l}>{l}</p>
              ))}
            </div>
          ) : null}
        </div>
      </details>
    </div>
  );
}
