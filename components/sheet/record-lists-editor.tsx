'use client';

import type { CalculationRecord } from '@/lib/sheets/content';

type Input = CalculationRecord['inputs'][number];
type Assumption = CalculationRecord['assumptions'][number];

const field = 'w-full rounded border border-rule-strong bg-surface px-2 py-1 text-sm font-normal text-ink';

/** Design inputs (each with its source and the source's revision) and assumptions (each marked whether it still needs verification). */
export function RecordListsEditor({
  record,
  onChange,
}: {
  record: CalculationRecord;
  onChange: (patch: Partial<CalculationRecord>) => void;
}) {
  const setInput = (i: number, patch: Partial<Input>) =>
    onChange({ inputs: record.inputs.map((x, j) => (j === i ? { ...x, ...patch } : x)) });
  const setAssumption = (i: number, patch: Partial<Assumption>) =>
    onChange({ assumptions: record.assumptions.map((x, j) => (j === i ? { ...x, ...patch } : x)) });
  return (
    <div className="space-y-4">
      <fieldset className="space-y-2">
        <legend className="text-sm font-semibold">Design inputs</legend>
        {record.inputs.map((input, i) => (
          <div
            key={i}
            className="grid gap-2 rounded border border-rule p-2 sm:grid-cols-[1fr_1fr_1fr_1.5fr_0.6fr_auto] sm:items-end"
          >
            <label className="flex flex-col gap-0.5 text-xs font-semibold text-ink-muted">
              <span>Name</span>
              <input
                aria-label={`Input ${i + 1} name`}
                value={input.name}
                onChange={(e) => setInput(i, { name: e.target.value })}
                className={field}
              />
            </label>
            <label className="flex flex-col gap-0.5 text-xs font-semibold text-ink-muted">
              <span>Value (with unit)</span>
              <input
                aria-label={`Input ${i + 1} value`}
                value={input.value}
                onChange={(e) => setInput(i, { value: e.target.value })}
                className={`${field} font-mono`}
              />
            </label>
            <label className="flex flex-col gap-0.5 text-xs font-semibold text-ink-muted">
              <span>Cell quantity it feeds</span>
              <input
                aria-label={`Input ${i + 1} cell quantity it feeds`}
                value={input.cell ?? ''}
                onChange={(e) => setInput(i, { cell: e.target.value || undefined })}
                className={`${field} font-mono`}
              />
            </label>
            <label className="flex flex-col gap-0.5 text-xs font-semibold text-ink-muted">
              <span>Source</span>
              <input
                aria-label={`Input ${i + 1} source`}
                value={input.source}
                onChange={(e) => setInput(i, { source: e.target.value })}
                className={field}
              />
            </label>
            <label className="flex flex-col gap-0.5 text-xs font-semibold text-ink-muted">
              <span>Source revision</span>
              <input
                aria-label={`Input ${i + 1} source revision`}
                value={input.sourceRevision}
                onChange={(e) => setInput(i, { sourceRevision: e.target.value })}
                className={field}
              />
            </label>
            <button
              type="button"
              onClick={() => onChange({ inputs: record.inputs.filter((_, j) => j !== i) })}
              className="rounded border border-fail px-2 text-sm text-fail"
              aria-label={`Remove input ${i + 1}`}
            >
              Remove
            </button>
          </div>
        ))}
        <button
          type="button"
          onClick={() =>
            onChange({ inputs: [...record.inputs, { name: '', value: '', source: '', sourceRevision: '' }] })
          }
          className="rounded border border-rule-strong bg-surface px-3 py-1 text-sm font-semibold"
        >
          Add a design input
        </button>
      </fieldset>
      <fieldset className="space-y-2">
        <legend className="text-sm font-semibold">Assumptions</legend>
        {record.assumptions.map((a, i) => (
          <div key={i} className="flex flex-wrap items-center gap-2 rounded border border-rule p-2">
            <input
              aria-label={`Assumption ${i + 1}`}
              value={a.text}
              onChange={(e) => setAssumption(i, { text: e.target.value })}
              className={`${field} min-w-64 flex-1`}
            />
            <fieldset className="flex flex-wrap items-center gap-3 text-sm">
              <legend className="sr-only">Assumption {i + 1}: verified?</legend>
              <label className="flex items-center gap-1">
                <input
                  type="radio"
                  name={`assumption-${i}-verification`}
                  checked={a.needsVerification === false}
                  onChange={() => setAssumption(i, { needsVerification: false })}
                />
                verified
              </label>
              <label className="flex items-center gap-1">
                <input
                  type="radio"
                  name={`assumption-${i}-verification`}
                  checked={a.needsVerification === true}
                  onChange={() => setAssumption(i, { needsVerification: true })}
                />
                still to be verified
              </label>
              {a.needsVerification === undefined ? (
                <span className="text-xs text-caution">choose one before saving</span>
              ) : null}
            </fieldset>
            <button
              type="button"
              onClick={() => onChange({ assumptions: record.assumptions.filter((_, j) => j !== i) })}
              className="rounded border border-fail px-2 text-sm text-fail"
              aria-label={`Remove assumption ${i + 1}`}
            >
              Remove
            </button>
          </div>
        ))}
        <button
          type="button"
          onClick={() =>
            // Neither answer is preset: the originator says whether the assumption is verified.
            onChange({
              assumptions: [...record.assumptions, { text: '', needsVerification: undefined as unknown as boolean }],
            })
          }
          className="rounded border border-rule-strong bg-surface px-3 py-1 text-sm font-semibold"
        >
          Add an assumption
        </button>
      </fieldset>
    </div>
  );
}
