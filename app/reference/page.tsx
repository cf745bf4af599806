import type { Metadata } from 'next';
import { TexMath } from '@/components/calc/tex-math';
import { CONSTANTS, CONSTANTS_EDITION } from '@/lib/calc/constants';
import { LIBRARY } from '@/lib/calc/functions';
import { ENGINE_VERSION } from '@/lib/calc/version';

export const metadata: Metadata = { title: 'Function reference' };

const KIND_LABEL: Record<string, string> = {
  speed: 'speed, or plain β',
  mass: 'mass, or energy as mc²',
  energy: 'energy',
  momentum: 'momentum, or energy as pc',
  time: 'time',
  length: 'length',
  acceleration: 'acceleration',
  voltage: 'voltage',
  charge: 'charge, or multiple of e',
  angle: 'angle, or radians',
  number: 'plain number',
};

export default function ReferencePage() {
  return (
    <div className="space-y-10">
      <header>
        <h1 className="text-2xl font-bold">Function reference</h1>
        <p className="mt-2 max-w-prose text-ink-muted">
          The built-in constants and the relativistic function library of the calculation engine ({ENGINE_VERSION};
          constants: {CONSTANTS_EDITION}). This page is generated from the library&apos;s own documentation.
        </p>
      </header>

      <section aria-labelledby="constants">
        <h2 id="constants" className="text-xl font-bold">
          Constants
        </h2>
        <div className="mt-3 overflow-x-auto">
          <table className="w-full border-collapse text-sm">
            <caption className="sr-only">Built-in constants with their provenance</caption>
            <thead>
              <tr className="border-b border-rule-strong text-left">
                <th scope="col" className="py-2 pr-4">Name</th>
                <th scope="col" className="py-2 pr-4">Quantity</th>
                <th scope="col" className="py-2 pr-4">Value</th>
                <th scope="col" className="py-2 pr-4">Standard uncertainty</th>
                <th scope="col" className="py-2">Provenance</th>
              </tr>
            </thead>
            <tbody>
              {CONSTANTS.map((k) => (
                <tr key={k.name} className="border-b border-rule align-top">
                  <td className="py-2 pr-4 font-mono">{k.name}</td>
                  <td className="py-2 pr-4">
                    <TexMath tex={k.tex} /> {k.description}
                  </td>
                  <td className="py-2 pr-4 font-mono">
                    {k.value} {k.unit}
                  </td>
                  <td className="py-2 pr-4 font-mono">{k.uncertainty === 0 ? 'exact' : `${k.uncertainty} ${k.unit}`}</td>
                  <td className="py-2">{k.provenance}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </section>

      <section aria-labelledby="functions">
        <h2 id="functions" className="text-xl font-bold">
          Functions
        </h2>
        <p className="mt-2 max-w-prose text-sm text-ink-muted">
          A speed argument takes a velocity in any speed unit or a plain number read as β = v/c. Inputs outside the domain
          are refused with a message naming the function and the value.
        </p>
        <div className="mt-4 space-y-4">
          {LIBRARY.map((f) => (
            <article key={f.name} id={f.name} aria-labelledby={`${f.name}-title`} className="rounded border border-rule bg-surface p-4">
              <h3 id={`${f.name}-title`} className="font-mono text-base font-bold">
                {f.name}({f.params.map((p) => p.name).join(', ')})
              </h3>
              <p className="mt-1">{f.doc.summary}</p>
              <div className="mt-2 overflow-x-auto">
                <TexMath tex={f.doc.formula} display />
              </div>
              <dl className="mt-2 grid gap-x-4 gap-y-1 text-sm sm:grid-cols-[8rem_minmax(0,1fr)]">
                <dt className="font-semibold">Arguments</dt>
                <dd>
                  {f.params.map((p) => (
                    <span key={p.name} className="block">
                      <code className="font-mono">{p.name}</code>: {p.description} ({KIND_LABEL[p.kind]})
                    </span>
                  ))}
                </dd>
                <dt className="font-semibold">Domain</dt>
                <dd>{f.doc.domain}</dd>
                <dt className="font-semibold">Example</dt>
                <dd>
                  <code className="font-mono">{f.doc.example}</code> → {f.doc.exampleResult}
                </dd>
                {f.doc.numerics ? (
                  <>
                    <dt className="font-semibold">Numerics</dt>
                    <dd>{f.doc.numerics}</dd>
                  </>
                ) : null}
                <dt className="font-semibold">Source</dt>
                <dd>{f.doc.source}</dd>
              </dl>
            </article>
          ))}
        </div>
      </section>
    </div>
  );
}
