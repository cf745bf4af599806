'use client';

import { ScrollBox } from '@/components/ui/scroll-box';
import { useMemo, useState } from 'react';
import { TexMath } from './tex-math';

export interface FunctionDocView {
  name: string;
  params: Array<{ name: string; description: string; kindLabel: string }>;
  summary: string;
  formula: string;
  domain: string;
  example: string;
  exampleResult: string;
  numerics?: string;
  source: string;
}

/** The library's own documentation, searchable by name, summary, arguments and domain. */
export function FunctionReference({ functions }: { functions: FunctionDocView[] }) {
  const [query, setQuery] = useState('');
  const shown = useMemo(() => {
    const q = query.trim().toLowerCase();
    if (!q) return functions;
    return functions.filter((f) =>
      [f.name, f.summary, f.domain, ...f.params.map((p) => `${p.name} ${p.description}`)]
        .join(' ')
        .toLowerCase()
        .includes(q),
    );
  }, [functions, query]);
  return (
    <div className="space-y-4">
      <div>
        <label htmlFor="function-search" className="block text-sm font-semibold">
          Search the functions
        </label>
        <input
          id="function-search"
          type="search"
          value={query}
          onChange={(e) => setQuery(e.target.value)}
          placeholder="e.g. rigidity, proper time, doppler"
          className="w-full max-w-md rounded border border-rule-strong bg-surface px-3 py-2"
        />
        <p role="status" aria-live="polite" className="mt-1 text-xs text-ink-muted">
          {shown.length} of {functions.length} functions
        </p>
      </div>
      {shown.map((f) => (
        <article
          key={f.name}
          id={f.name}
          aria-labelledby={`${f.name}-title`}
          className="rounded border border-rule bg-surface p-4"
        >
          <h3 id={`${f.name}-title`} className="break-words font-mono text-base font-bold">
            {f.name}({f.params.map((p) => p.name).join(', ')})
          </h3>
          <p className="mt-1">{f.summary}</p>
          <ScrollBox className="mt-2" scrollLabel={`Formula of ${f.name} (scrolls sideways)`}>
            <TexMath tex={f.formula} display />
          </ScrollBox>
          <dl className="mt-2 grid grid-cols-1 gap-x-4 gap-y-1 break-words text-sm sm:grid-cols-[8rem_minmax(0,1fr)]">
            <dt className="font-semibold">Arguments</dt>
            <dd>
              {f.params.map((p) => (
                <span key={p.name} className="block">
                  <code className="font-mono">{p.name}</code>: {p.description} ({p.kindLabel})
                </span>
              ))}
            </dd>
            <dt className="font-semibold">Domain</dt>
            <dd>{f.domain}</dd>
            <dt className="font-semibold">Example</dt>
            <dd>
              <code className="font-mono">{f.example}</code> → {f.exampleResult}
            </dd>
            {f.numerics ? (
              <>
                <dt className="font-semibold">Numerics</dt>
                <dd>{f.numerics}</dd>
              </>
            ) : null}
            <dt className="font-semibold">Source</dt>
            <dd>{f.source}</dd>
          </dl>
        </article>
      ))}
    </div>
  );
}
