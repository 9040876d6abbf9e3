/**
 * Runs every `*.bench.ts` in this folder and reports mean, median and 99th-percentile time per
 * call in microseconds. Speed targets are reported here, never asserted in tests.
 *
 *   npm run bench                 a table per file
 *   npm run bench -- --json       one JSON line per benchmark (for scripts and CI logs)
 *   npm run bench -- sim          only the files whose name contains "sim"
 *
 * A bench file exports `benchmarks: Benchmark[]` (many timed calls of a small function), and/or
 * `throughput: Throughput[]` (one long run of a workload that measures itself — e.g. replicates
 * per second of a simulation — and returns a flat record; with --json, one line per workload).
 */
import { readdirSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

export interface Benchmark {
  name: string;
  fn: () => unknown;
  /** Timed calls (default 2,000). */
  iterations?: number;
  /** Untimed calls first, so the JIT has settled (default iterations / 10). */
  warmup?: number;
  /** Target mean time in µs, reported as met or not. */
  targetMeanUs?: number;
}

export interface BenchResult {
  file: string;
  name: string;
  iterations: number;
  meanUs: number;
  medianUs: number;
  p99Us: number;
  maxUs: number;
  targetMeanUs?: number;
  meetsTarget?: boolean;
}

/** A workload that runs once and reports its own figures. */
export interface Throughput {
  name: string;
  run: () => ThroughputResult | Promise<ThroughputResult>;
}

/** The figures of one throughput run: `name`, then any flat fields (numbers, strings, booleans). */
export interface ThroughputResult {
  name: string;
  [field: string]: string | number | boolean | null;
}

/** Keeps results alive so the engine cannot drop the timed calls. */
let sink: unknown;

export function measure(file: string, b: Benchmark): BenchResult {
  const iterations = b.iterations ?? 2000;
  const warmup = b.warmup ?? Math.ceil(iterations / 10);
  for (let i = 0; i < warmup; i++) sink = b.fn();
  const times = new Float64Array(iterations);
  for (let i = 0; i < iterations; i++) {
    const t0 = process.hrtime.bigint();
    sink = b.fn();
    times[i] = Number(process.hrtime.bigint() - t0) / 1000;
  }
  const sorted = Array.from(times).sort((x, y) => x - y);
  const at = (q: number) => sorted[Math.min(sorted.length - 1, Math.ceil(q * sorted.length) - 1)]!;
  const meanUs = sorted.reduce((s, x) => s + x, 0) / sorted.length;
  return {
    file,
    name: b.name,
    iterations,
    meanUs,
    medianUs: at(0.5),
    p99Us: at(0.99),
    maxUs: sorted[sorted.length - 1]!,
    ...(b.targetMeanUs !== undefined ? { targetMeanUs: b.targetMeanUs, meetsTarget: meanUs <= b.targetMeanUs } : {}),
  };
}

async function main(): Promise<void> {
  const json = process.argv.includes('--json');
  const filters = process.argv.slice(2).filter((a) => !a.startsWith('--'));
  const dir = path.dirname(fileURLToPath(import.meta.url));
  const files = readdirSync(dir)
    .filter((f) => f.endsWith('.bench.ts') && (filters.length === 0 || filters.some((s) => f.includes(s))))
    .sort();
  const r1 = (x: number) => x.toFixed(1);
  for (const file of files) {
    const mod = (await import(pathToFileURL(path.join(dir, file)).href)) as { benchmarks?: Benchmark[]; throughput?: Throughput[] };
    const list = mod.benchmarks ?? [];
    if (!json) console.log(`\n${file}`);
    for (const b of list) {
      const r = measure(file, b);
      if (json) console.log(JSON.stringify(r));
      else
        console.log(
          `  ${r.name.padEnd(40)} mean ${r1(r.meanUs).padStart(8)} µs   median ${r1(r.medianUs).padStart(8)} µs   p99 ${r1(r.p99Us).padStart(8)} µs   (${r.iterations} runs)` +
            (r.targetMeanUs !== undefined ? `   target ${r.targetMeanUs} µs: ${r.meetsTarget ? 'met' : 'NOT met'}` : ''),
        );
    }
    for (const t of mod.throughput ?? []) {
      const r = await t.run();
      if (json) console.log(JSON.stringify({ file, ...r }));
      else console.log(`  ${r.name}\n${Object.entries(r).filter(([k]) => k !== 'name').map(([k, v]) => `      ${k.padEnd(28)} ${v}`).join('\n')}`);
    }
  }
  void sink;
}

main().catch((e: unknown) => {
  console.error(e);
  process.exit(1);
});
