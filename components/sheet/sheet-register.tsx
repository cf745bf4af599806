'use client';

import Link from 'next/link';
import { useMemo, useState } from 'react';
import { SHEET_STATUS_LABELS, type SheetStatus } from '@/lib/checks/status';
import { VisibleText } from '@/components/data/visible-text';
import { Table, Td, Th } from '@/components/ui/table';

/** The workflow status, or Void for a sheet voided as created by mistake (lib/sheets/void.ts). */
function statusLabel(status: string): string {
  return status === 'void' ? 'Void' : (SHEET_STATUS_LABELS[status as SheetStatus] ?? status);
}

export interface RegisterRow {
  id: string;
  number: number;
  code: string;
  title: string;
  safetyRelated: boolean;
  starter?: boolean;
  status: string;
  currentRevision: string | null;
  latestVersion: number | null;
  originator: string;
  updatedAt: string;
  /** Revisions the latest version cites that are no longer current: "TPT2-CALC-0001 rev A (now B)". */
  supersededInputs?: string[];
}

type Key = 'code' | 'title' | 'status' | 'currentRevision' | 'latestVersion' | 'originator' | 'updatedAt';
const COLUMNS: Array<{ key: Key; label: string }> = [
  { key: 'code', label: 'Number' },
  { key: 'title', label: 'Title' },
  { key: 'status', label: 'Status' },
  { key: 'currentRevision', label: 'Current revision' },
  { key: 'latestVersion', label: 'Latest version' },
  { key: 'originator', label: 'Originator' },
  { key: 'updatedAt', label: 'Updated (UTC)' },
];

/** The register of a project's sheets: sortable by any column, filtered by text. */
export function SheetRegister({ rows, projectCode }: { rows: RegisterRow[]; projectCode: string }) {
  const [sort, setSort] = useState<{ key: Key; dir: 1 | -1 }>({ key: 'code', dir: 1 });
  const [filter, setFilter] = useState('');
  const shown = useMemo(() => {
    const f = filter.trim().toLowerCase();
    const list = f
      ? rows.filter((r) =>
          `${r.code} ${r.title} ${r.originator} ${statusLabel(r.status)}${r.supersededInputs?.length ? ' superseded input' : ''}`
            .toLowerCase()
            .includes(f),
        )
      : rows;
    return [...list].sort((a, b) => {
      const x = a[sort.key] ?? '';
      const y = b[sort.key] ?? '';
      return (x < y ? -1 : x > y ? 1 : 0) * sort.dir;
    });
  }, [rows, sort, filter]);
  return (
    <div className="space-y-3">
      <div>
        <label htmlFor="register-filter" className="block text-sm font-semibold">
          Filter
        </label>
        <input
          id="register-filter"
          value={filter}
          onChange={(e) => setFilter(e.target.value)}
          className="w-full max-w-sm rounded border border-rule-strong bg-surface px-3 py-2"
          placeholder="number, title, originator…"
        />
      </div>
      <Table caption={`Calculation sheets of ${projectCode}`}>
        <thead>
          <tr className="border-b border-rule-strong text-left">
            {COLUMNS.map((c) => (
              <Th
                key={c.key}
                aria-sort={sort.key === c.key ? (sort.dir === 1 ? 'ascending' : 'descending') : 'none'}
                className="py-2 pr-3"
              >
                <button
                  type="button"
                  onClick={() => setSort((s) => ({ key: c.key, dir: s.key === c.key ? (-s.dir as 1 | -1) : 1 }))}
                  className="font-semibold hover:underline"
                >
                  {c.label}
                  {sort.key === c.key ? (sort.dir === 1 ? ' ▲' : ' ▼') : ''}
                </button>
              </Th>
            ))}
          </tr>
        </thead>
        <tbody>
          {shown.map((r) => (
            <tr key={r.id} className="border-b border-rule">
              <Td className="py-2 pr-3 font-mono whitespace-nowrap">
                <Link
                  href={`/projects/${projectCode}/sheets/${r.number}`}
                  className="font-semibold text-accent underline"
                >
                  {r.code}
                </Link>
              </Td>
              <Td className="py-2 pr-3">
                <VisibleText text={r.title} />
                {r.safetyRelated ? (
                  <span className="ml-2 rounded bg-caution-soft px-1.5 py-0.5 text-xs font-bold text-caution">
                    safety-related
                  </span>
                ) : null}
                {r.starter ? (
                  <span className="ml-2 rounded bg-accent-soft px-1.5 py-0.5 text-xs font-bold text-accent-hover">
                    starter
                  </span>
                ) : null}
              </Td>
              <Td className="py-2 pr-3">
                {statusLabel(r.status)}
                {r.supersededInputs?.length ? (
                  <Link
                    href={`/projects/${projectCode}/sheets/${r.number}#superseded-inputs`}
                    className="mt-1 block w-fit rounded bg-caution-soft px-1.5 py-0.5 text-xs font-bold text-caution underline"
                  >
                    Superseded input<span className="sr-only"> of {r.code}</span>: {r.supersededInputs.join('; ')}
                  </Link>
                ) : null}
              </Td>
              <Td className="py-2 pr-3">{r.currentRevision ?? '—'}</Td>
              <Td className="py-2 pr-3 font-mono">{r.latestVersion ?? '—'}</Td>
              <Td className="py-2 pr-3">{r.originator}</Td>
              <Td className="py-2 pr-3 font-mono whitespace-nowrap">{r.updatedAt.slice(0, 16).replace('T', ' ')}</Td>
            </tr>
          ))}
        </tbody>
      </Table>
      {shown.length === 0 ? <p className="text-ink-muted">No sheets match.</p> : null}
    </div>
  );
}
