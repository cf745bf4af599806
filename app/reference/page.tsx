import type { Metadata } from 'next';
import { FunctionReference } from '@/components/calc/function-reference';
import { TexMath } from '@/components/calc/tex-math';
import { CONSTANTS, CONSTANTS_EDITION } from '@/lib/calc/constants';
import { LIBRARY, type ParamKind } from '@/lib/calc/functions';
import { LINT_EXAMPLES } from '@/lib/calc/lint';
import { NAME_EXAMPLES } from '@/lib/calc/reference-examples';
import { STUDY_FUNCTION_DOCS } from '@/lib/calc/study-functions';
import { ENGINE_VERSION } from '@/lib/calc/version';
import { DISPLAY_UNITS_LABEL, UNIT_EXAMPLES } from '@/lib/calc/display-units';
import { Table, Td, Th } from '@/components/ui/table';

export const metadata: Metadata = { title: 'Function reference' };

const KIND_LABEL: Record<ParamKind, string> = {
  speed: 'speed, or plain β',
  mass: 'mass, or energy as mc²',
  energy: 'energy',
  momentum: 'momentum, or energy as pc',
  time: 'time',
  length: 'length',
  acceleration: 'acceleration',
  voltage: 'voltage',
  charge: 'charge, or integer charge number',
  angle: 'angle, or radians',
  rigidity: 'magnetic rigidity (T m)',
  'gravitational-parameter': 'gravitational parameter GM (m³/s²)',
  area: 'area',
  'magnetic-field': 'magnetic flux density (T)',
  'energy-per-nucleon': 'kinetic energy per nucleon (MeV, or MeV/u read as per nucleon)',
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
        <Table caption="Built-in constants with their provenance" box="mt-3">
          <thead>
            <tr className="border-b border-rule-strong text-left">
              <Th className="py-2 pr-4">Name</Th>
              <Th className="py-2 pr-4">Quantity</Th>
              <Th className="py-2 pr-4">Value</Th>
              <Th className="py-2 pr-4">Standard uncertainty</Th>
              <Th className="py-2">Provenance</Th>
            </tr>
          </thead>
          <tbody>
            {CONSTANTS.map((k) => (
              <tr key={k.name} className="border-b border-rule align-top">
                <Td className="py-2 pr-4 font-mono">{k.name}</Td>
                <Td className="py-2 pr-4">
                  <TexMath tex={k.tex} /> {k.description}
                </Td>
                <Td className="py-2 pr-4 font-mono">
                  {k.value} {k.unit}
                </Td>
                <Td className="py-2 pr-4 font-mono">{k.uncertainty === 0 ? 'exact' : `${k.uncertainty} ${k.unit}`}</Td>
                <Td className="py-2">{k.provenance}</Td>
              </tr>
            ))}
          </tbody>
        </Table>
      </section>

      <section aria-labelledby="units">
        <h2 id="units" className="text-xl font-bold">
          Units of the trade and the units shown
        </h2>
        <p className="mt-2 max-w-prose text-sm text-ink-muted">
          Besides the SI units and their prefixes, a sheet can write momenta in <code className="font-mono">eV/c</code>{' '}
          … <code className="font-mono">TeV/c</code> and masses in <code className="font-mono">eV/c^2</code> …{' '}
          <code className="font-mono">TeV/c^2</code> (after a number, after <code className="font-mono">to</code> and in{' '}
          <code className="font-mono">number(x, &quot;MeV/c&quot;)</code>; elsewhere{' '}
          <code className="font-mono">c</code> is the speed of light), <code className="font-mono">u</code> (unified
          atomic mass unit, = Da), <code className="font-mono">yr</code> and <code className="font-mono">a</code>{' '}
          (Julian year), <code className="font-mono">ppm</code>, <code className="font-mono">ppb</code> and rates such
          as <code className="font-mono">us/day</code>. Numbers are shown to the sheet&apos;s significant figures with
          their trailing zeros (1.967 50). The sheet setting &quot;Units shown&quot; chooses SI units or accelerator
          units, where energies, momenta and masses at particle scale are shown in eV, eV/c and eV/c² with a prefix
          chosen by size; a unit written in the formula (<code className="font-mono">3 kg</code>,{' '}
          <code className="font-mono">x to J</code>) is kept, and the stored values are the same either way.
        </p>
        <Table caption="Examples of the units" box="mt-3">
          <thead>
            <tr className="border-b border-rule-strong text-left">
              <Th className="py-2 pr-4">Statement</Th>
              <Th className="py-2 pr-4">Units shown</Th>
              <Th className="py-2 pr-4">Result</Th>
              <Th className="py-2">Note</Th>
            </tr>
          </thead>
          <tbody>
            {UNIT_EXAMPLES.map((x) => (
              <tr key={`${x.source}:${x.displayUnits}`} className="border-b border-rule align-top">
                <Td className="py-2 pr-4 font-mono">{x.source}</Td>
                <Td className="py-2 pr-4">{DISPLAY_UNITS_LABEL[x.displayUnits]}</Td>
                <Td className="py-2 pr-4 font-mono">{x.result}</Td>
                <Td className="py-2">{x.note}</Td>
              </tr>
            ))}
          </tbody>
        </Table>
      </section>

      <section aria-labelledby="lint">
        <h2 id="lint" className="text-xl font-bold">
          Warnings: units and numbers that look like constants
        </h2>
        <p className="mt-2 max-w-prose text-sm text-ink-muted">
          Some short names are units or mathematical constants, not physical constants:{' '}
          <code className="font-mono">h</code> is the hour, <code className="font-mono">hbar</code> the hectobar,{' '}
          <code className="font-mono">g</code> the gram, <code className="font-mono">kB</code> the kilobyte,{' '}
          <code className="font-mono">e</code> and <code className="font-mono">E</code> Euler&apos;s number. Such a name
          used by itself (not as a unit after a number, not <code className="font-mono">e</code> as the base of a power)
          gets a warning beside the statement, in the check view, in the issued PDF and in{' '}
          <code className="font-mono">npm run calc -- --json</code> (<code className="font-mono">cells[].warnings</code>
          ); the statement is still evaluated as written. A sheet that defines the name itself gets no warning.
        </p>
        <Table caption="Examples of the warnings" box="mt-3">
          <thead>
            <tr className="border-b border-rule-strong text-left">
              <Th className="py-2 pr-4">Statement</Th>
              <Th className="py-2">Warning</Th>
            </tr>
          </thead>
          <tbody>
            {LINT_EXAMPLES.map((x) => (
              <tr key={x.source} className="border-b border-rule align-top">
                <Td className="py-2 pr-4 font-mono">{x.source}</Td>
                <Td className="py-2">{x.warning ?? 'none'}</Td>
              </tr>
            ))}
          </tbody>
        </Table>
      </section>

      <section aria-labelledby="names">
        <h2 id="names" className="text-xl font-bold">
          Names
        </h2>
        <p className="mt-2 max-w-prose text-sm text-ink-muted">
          A name starts with a letter, Latin or Greek, and holds letters, digits and underscores (
          <code className="font-mono">γ</code>, <code className="font-mono">Δp</code>,{' '}
          <code className="font-mono">θ_1</code>, <code className="font-mono">T_kin</code>); Greek letters are typeset
          as such. The constants above and the mathematical values (<code className="font-mono">pi</code>,{' '}
          <code className="font-mono">e</code>, …) cannot be redefined.
        </p>
        <p className="mt-2 max-w-prose text-sm text-ink-muted">
          <strong>Precedence:</strong> a sheet may define a name that is also a built-in function (
          <code className="font-mono">gamma</code>, <code className="font-mono">beta</code>,{' '}
          <code className="font-mono">sin</code>, a library function). The sheet&apos;s definition then takes precedence
          over the built-in function everywhere in that sheet: a call such as{' '}
          <code className="font-mono">gamma(5)</code> after <code className="font-mono">gamma = 1.25</code> is an error
          that says so, never a silent call of the built-in. To use the built-in function, give the quantity another
          name.
        </p>
        <Table
          caption="Examples of names and of a definition taking precedence over a built-in function"
          className="w-full text-left text-sm"
          box="mt-4"
        >
          <thead>
            <tr className="border-b border-rule">
              <Th className="py-1 pr-4">Statements</Th>
              <Th className="py-1 pr-4">Result</Th>
              <Th className="py-1">Note</Th>
            </tr>
          </thead>
          <tbody>
            {NAME_EXAMPLES.map((x) => (
              <tr key={x.source} className="border-b border-rule align-top">
                <Td className="whitespace-pre py-1 pr-4 font-mono">{x.source}</Td>
                <Td className="py-1 pr-4 font-mono">{x.result ?? 'error'}</Td>
                <Td className="py-1">{x.note}</Td>
              </tr>
            ))}
          </tbody>
        </Table>
      </section>

      <section aria-labelledby="functions">
        <h2 id="functions" className="text-xl font-bold">
          Functions
        </h2>
        <p className="mt-2 max-w-prose text-sm text-ink-muted">
          A speed argument takes a velocity in any speed unit or a plain number read as β = v/c. Inputs outside the
          domain are refused with a message naming the function and the value.
        </p>
        <div className="mt-4">
          <FunctionReference
            functions={LIBRARY.map((f) => ({
              name: f.name,
              params: f.params.map((p) => ({
                name: p.name,
                description: p.description,
                kindLabel: KIND_LABEL[p.kind],
              })),
              summary: f.doc.summary,
              formula: f.doc.formula,
              domain: f.doc.domain,
              example: f.doc.example,
              exampleResult: f.doc.exampleResult,
              numerics: f.doc.numerics,
              source: f.doc.source,
            }))}
          />
        </div>
      </section>

      <section aria-labelledby="studies">
        <h2 id="studies" className="text-xl font-bold">
          Studies: sweeps, plots, uncertainty and citations
        </h2>
        <p className="mt-2 max-w-prose text-sm text-ink-muted">
          A sweep or a plot evaluates the sheet&apos;s own statements again for each value of one input, so each row is
          what the sheet gives for that value. Uncertainties are propagated to first order with sensitivity coefficients
          (JCGM 100:2008); where the model is markedly non-linear, a Monte Carlo propagation (JCGM 101:2008, 10 000
          draws, fixed seed; at most eight per sheet) runs as well and a warning shows when the two disagree.
        </p>
        <dl className="mt-4 space-y-4">
          {STUDY_FUNCTION_DOCS.map((d) => (
            <div key={d.name} className="rounded border border-rule p-3">
              <dt className="font-mono font-bold">{d.signature}</dt>
              <dd className="mt-1 text-sm">{d.summary}</dd>
              <dd className="mt-1 text-sm">
                Example: <code className="font-mono">{d.example}</code>
              </dd>
            </div>
          ))}
        </dl>
      </section>
    </div>
  );
}
