// Benchmark of drawing the issued PDF (`npx tsx tests/bench/pdf-bench.ts`): the test fixture and
// generated sheets of 50 and 200 cells (three in four are four-statement calculation cells, so each
// has eight typeset formulas), each rendered twice in one process (the first pays for loading fonts,
// MathJax and the JIT). Prints wall and CPU time, pages, size, and the time per cell relative to the
// 50-cell sheet. Set NODE_ENV=production to measure React's production build, as the server runs it.
import { performance } from 'node:perf_hooks';
import { renderRevisionPdf } from '../../lib/issue/pdf/render';
import { buildRevisionPdfData, generatedCells } from '../issue/pdf-fixture';

const cases: Array<{ name: string; cells: number | null }> = [
  { name: 'fixture', cells: null },
  { name: '50 cells', cells: 50 },
  { name: '200 cells', cells: 200 },
];

const results: Array<{ name: string; cells: number; wall: number[]; cpu: number[]; pages: number; bytes: number }> = [];
for (const c of cases) {
  const data = buildRevisionPdfData(c.cells ? { cells: generatedCells(c.cells) } : {});
  const wall: number[] = [];
  const cpu: number[] = [];
  let pdf: Buffer = Buffer.alloc(0);
  for (let i = 0; i < 2; i++) {
    const t = performance.now();
    const u = process.cpuUsage();
    pdf = await renderRevisionPdf(data);
    const used = process.cpuUsage(u);
    wall.push(performance.now() - t);
    cpu.push((used.user + used.system) / 1000);
  }
  const pages = (pdf.toString('latin1').match(/\/Type \/Page\b/g) ?? []).length;
  results.push({ name: c.name, cells: data.version.content.cells.length, wall, cpu, pages, bytes: pdf.length });
}

const per50 = Math.min(...results.find((r) => r.name === '50 cells')!.wall) / 50;
console.log(`NODE_ENV=${process.env.NODE_ENV ?? '(unset)'}`);
for (const r of results) {
  const best = Math.min(...r.wall);
  console.log(
    `${r.name.padEnd(10)} ${String(r.cells).padStart(4)} cells ${String(r.pages).padStart(3)} pages ${(r.bytes / 1024).toFixed(0).padStart(6)} KiB  ` +
      `first ${r.wall[0].toFixed(0)} ms (cpu ${r.cpu[0].toFixed(0)})  again ${r.wall[1].toFixed(0)} ms (cpu ${r.cpu[1].toFixed(0)})  ` +
      `per cell ×${(best / r.cells / per50).toFixed(2)} of the 50-cell sheet's`,
  );
}
