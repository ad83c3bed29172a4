/**
 * The command line in-process (main with captured streams): help and examples, exit codes,
 * --json everywhere, input from a file or standard input in every format src/io reads, output
 * formats, the household closure and its report, NO_COLOR and progress bars.
 */
import { createHash } from 'node:crypto';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { Matrix as MlMatrix, inverse } from 'ml-matrix';
import Papa from 'papaparse';
import { beforeAll, describe, expect, it } from 'vitest';
import type { Fixtures } from './fixtures';
import { TWO_SECTORS, writeFixtures } from './fixtures';
import { ROOT, run } from './harness';

const COMMANDS = ['check', 'coefficients', 'requirements', 'multipliers', 'impact', 'uncertainty', 'linkages', 'price', 'extract', 'report', 'convert', 'aggregate'];
let fx: Fixtures;

beforeAll(async () => {
  fx = await writeFixtures();
});

/** Open (Type I) and closed (Type II) output multipliers of the two-sector table by ml-matrix (source: ml-matrix 6.15.1). */
function reference() {
  const x = TWO_SECTORS.x!;
  const A = new MlMatrix(TWO_SECTORS.Z.map((r) => r.map((v, j) => v / x[j]!)));
  const L = inverse(MlMatrix.eye(2).sub(A));
  const coe = TWO_SECTORS.valueAdded!.values[0]!;
  const hh = TWO_SECTORS.finalDemand!.values.map((r) => r[0]!);
  const total = coe.reduce((a, b) => a + b, 0);
  const C = new MlMatrix(3, 3);
  for (let i = 0; i < 2; i++) for (let j = 0; j < 2; j++) C.set(i, j, A.get(i, j));
  for (let i = 0; i < 2; i++) C.set(i, 2, hh[i]! / total);
  for (let j = 0; j < 2; j++) C.set(2, j, coe[j]! / x[j]!);
  const Lc = inverse(MlMatrix.eye(3).sub(C));
  const open = [0, 1].map((j) => L.get(0, j) + L.get(1, j));
  const closed = [0, 1].map((j) => Lc.get(0, j) + Lc.get(1, j));
  return { L, open, closed };
}

describe('help, version and usage errors', () => {
  it('every subcommand has help with examples (exit 0); --version prints the package version', async () => {
    for (const c of COMMANDS) {
      const r = await run([c, '--help']);
      expect(r.code, c).toBe(0);
      expect(r.stdout, c).toContain('Examples:');
      expect(r.stdout, c).toContain(`$ ripplewise ${c}`);
      expect(r.stdout, c).toContain('--json');
    }
    const top = await run(['--help']);
    expect(top.code).toBe(0);
    for (const c of COMMANDS) expect(top.stdout).toContain(c);
    expect(top.stdout).toMatch(/Exit codes: 0 success, 1 the table failed its checks, 2 a usage or input error/);
    const v = await run(['--version']);
    expect(v.code).toBe(0);
    expect(v.stdout.trim()).toBe(JSON.parse(readFileSync(join(ROOT, 'package.json'), 'utf8')).version);
  });

  it('usage errors exit 2 with a message: unknown option, unknown command, missing option, bad values, no command', async () => {
    const cases: [string[], RegExp][] = [
      [['multipliers', fx.json, '--bogus'], /unknown option '--bogus'/],
      [['nonsense'], /unknown command 'nonsense'/],
      [['impact', fx.json], /--scenario/],
      [['coefficients', fx.json, '--kind', 'sideways'], /--kind sideways is not known/],
      [['multipliers', fx.json, '--out', 'm.pdf'], /cannot tell the format of 'm.pdf'/],
      [['multipliers', fx.json, '--format', 'tsv'], /--format tsv is not available here/],
      [['multipliers', fx.json, '--locale', 'not a locale!', '--out', join(fx.dir, 'x.html')], /--locale 'not a locale!' is not a locale tag/],
      [['multipliers', fx.json, '--propensity', '1.5'], /--propensity must be a share from 0 to 1/],
      [['report', fx.json, '--tornado-top', '0', '--out', join(fx.dir, 'r.html')], /--tornado-top must be a whole number from 1/],
      [['requirements', '--make', 'm.txt', '--use', 'u.txt', '--kind', 'upside-down'], /--kind upside-down is not known/],
      [[], /Usage: ripplewise/],
    ];
    for (const [argv, re] of cases) {
      const r = await run(argv);
      expect(r.code, argv.join(' ')).toBe(2);
      expect(r.stderr, argv.join(' ')).toMatch(re);
    }
  });

  it('a missing file exits 2 with a message naming the file; --json gives the error as JSON', async () => {
    const r = await run(['check', 'no-such-table.csv']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain("'no-such-table.csv' does not exist");
    const j = await run(['multipliers', 'absent.xlsx', '--json']);
    expect(j.code).toBe(2);
    const e = JSON.parse(j.stdout).error;
    expect(e.code).toBe('missing-file');
    expect(e.message).toContain('absent.xlsx');
    const s = await run(['impact', fx.json, '--scenario', 'gone.json']);
    expect(s.code).toBe(2);
    expect(s.stderr).toContain('gone.json');
  });

  it('a table that fails its checks exits 1 (check lists the findings; analyses refuse)', async () => {
    const c = await run(['check', fx.bad]);
    expect(c.code).toBe(1);
    expect(c.stdout).toMatch(/FAILED/);
    expect(c.stdout).toMatch(/error/);
    const j = await run(['check', fx.bad, '--json']);
    expect(j.code).toBe(1);
    const doc = JSON.parse(j.stdout);
    expect(doc.passed).toBe(false);
    expect(doc.errors).toBeGreaterThan(0);
    const m = await run(['multipliers', fx.bad]);
    expect(m.code).toBe(1);
    expect(m.stderr).toMatch(/failed \d+ check/);
    const ok = await run(['check', fx.json]);
    expect(ok.code).toBe(0);
    expect(ok.stdout).toMatch(/passed/);
  });
});

describe('results', () => {
  it('multipliers --json: Type I and II by measure, the household closure guessed and reported (source: Miller and Blair 2009, ch. 2, from memory; ml-matrix 6.15.1)', async () => {
    const r = await run(['multipliers', fx.json, '--json']);
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.stdout);
    const ref = reference();
    const out = doc.measures.find((m: { code: string }) => m.code === 'output');
    // Output multipliers of the worked example: 1.518 and 1.452 (from memory).
    expect(out.sectors[0].simple).toBeCloseTo(1.518, 3);
    expect(out.sectors[1].simple).toBeCloseTo(1.452, 3);
    for (let j = 0; j < 2; j++) {
      expect(Math.abs(out.sectors[j].simple - ref.open[j]!)).toBeLessThan(1e-12);
      expect(Math.abs(out.sectors[j].total - ref.closed[j]!)).toBeLessThan(1e-12);
      expect(Math.abs(out.sectors[j].typeII - ref.closed[j]!)).toBeLessThan(1e-12);
    }
    expect(doc.typeII).toBe(true);
    const s = Object.fromEntries(doc.settings.map((x: { key: string; value: unknown; source: string }) => [x.key, x]));
    expect(s.householdColumn).toMatchObject({ value: 'HH', source: 'guessed' });
    expect(s.labourIncomeRow).toMatchObject({ value: 'COE', source: 'guessed' });
    expect(s.jobs).toMatchObject({ value: 'JOBS', source: 'guessed' });
    // No jobs in S2: its jobs Type I and II are blank (null), with a note.
    const jobs = doc.measures.find((m: { code: string }) => m.code === 'JOBS');
    expect(jobs.sectors[1].typeI).toBeNull();
    expect(jobs.sectors[1].typeII).toBeNull();
    expect(typeof jobs.sectors[0].typeI).toBe('number');
    expect(jobs.notes.join(' ')).toMatch(/not defined/);
    expect(r.stdout).not.toMatch(/NaN/);
    expect(doc.sha256).toBe(createHash('sha256').update(readFileSync(fx.json)).digest('hex'));
    expect(doc.cautions.length).toBeGreaterThanOrEqual(5);

    const given = JSON.parse((await run(['multipliers', fx.json, '--household-column', 'HH', '--labour-income-row', 'COE', '--json'])).stdout);
    expect(given.settings.find((x: { key: string }) => x.key === 'householdColumn').source).toBe('given');
    const open = JSON.parse((await run(['multipliers', fx.json, '--no-household', '--measure', 'output', '--json'])).stdout);
    expect(open.typeII).toBe(false);
    expect(open.measures).toHaveLength(1);
    expect(open.measures[0].sectors[0].typeII).toBeNull();
  });

  it('reads the same table from JSON, CSV, XLSX (--sheet) and standard input, and hashes what it read', async () => {
    const base = JSON.parse((await run(['multipliers', fx.json, '--json'])).stdout).measures;
    for (const argv of [
      ['multipliers', fx.csv, '--json'],
      ['multipliers', fx.xlsx, '--sheet', 'IO', '--json'],
    ]) {
      const r = await run(argv);
      expect(r.code, argv.join(' ')).toBe(0);
      expect(JSON.parse(r.stdout).measures, argv.join(' ')).toEqual(base);
    }
    const bytes = readFileSync(fx.csv);
    const s = await run(['multipliers', '-', '--json'], { stdin: bytes });
    expect(s.code).toBe(0);
    const doc = JSON.parse(s.stdout);
    expect(doc.measures).toEqual(base);
    expect(doc.sha256).toBe(createHash('sha256').update(bytes).digest('hex'));
    const tty = await run(['check', '-'], { stdinTTY: true });
    expect(tty.code).toBe(2);
    expect(tty.stderr).toMatch(/standard input is a terminal/);
  });

  it('impact --json: direct and indirect output of a demand change (source: Miller and Blair 2009, ch. 2, x = [1247.52, 1841.58] for f = [600, 1500], from memory)', async () => {
    const r = await run(['impact', fx.json, '--scenario', fx.scenario, '--name', 'New demand', '--no-household', '--json']);
    expect(r.code).toBe(0);
    const sc = JSON.parse(r.stdout).scenarios;
    expect(sc).toHaveLength(1);
    const out = sc[0].measures.find((m: { code: string }) => m.code === 'output');
    const x = out.sectors.map((s: { total: number }) => s.total);
    expect(1000 + x[0]).toBeCloseTo(1247.52, 2);
    expect(2000 + x[1]).toBeCloseTo(1841.58, 2);
    expect(out.sectors[0].direct).toBe(250);
    expect(out.totals.induced).toBe(0);
    const both = JSON.parse((await run(['impact', fx.json, '--scenario', fx.scenario, '--json'])).stdout);
    expect(both.scenarios.map((s: { name: string }) => s.name)).toEqual(['New demand', 'Exports up']);
    expect(both.scenarios[1].totalGross).toBeCloseTo(70, 12); // 10 % of exports of S2 (700)
    const bad = await run(['impact', fx.json, '--scenario', fx.scenario, '--name', 'Nothing']);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/no scenario named 'Nothing'/);
  });

  it('coefficients to standard output as CSV (codes in the first column and the header row) and as JSON', async () => {
    const r = await run(['coefficients', fx.json, '--kind', 'total-requirements', '--format', 'csv']);
    expect(r.code).toBe(0);
    const rows = Papa.parse<string[]>(r.stdout.trim()).data;
    expect(rows[0]).toEqual(['sector', 'S1', 'S2']);
    expect(rows.map((x) => x[0])).toEqual(['sector', 'S1', 'S2']);
    const L = reference().L;
    for (let i = 0; i < 2; i++) for (let j = 0; j < 2; j++) expect(Math.abs(Number(rows[i + 1]![j + 1]) - L.get(i, j))).toBeLessThan(1e-12);
    const j = JSON.parse((await run(['coefficients', fx.json, '--json'])).stdout);
    expect(j.values[0][1]).toBe(0.25);
    const both = await run(['coefficients', fx.json, '--json', '--out', '-']);
    expect(both.code).toBe(2);
  });

  it('linkages, price, extract, convert and aggregate answer with --json', async () => {
    const ref = reference();
    const l = JSON.parse((await run(['linkages', fx.json, '--json'])).stdout);
    const mean = (ref.open[0]! + ref.open[1]!) / 2;
    expect(Math.abs(l.sectors[0].power - ref.open[0]! / mean)).toBeLessThan(1e-12);
    expect(l.sectors.map((s: { group: string }) => s.group)).toHaveLength(2);
    const p = JSON.parse((await run(['price', fx.json, '--value-added-percent', '10', '--row', 'COE', '--json'])).stdout);
    // Base prices are 1 in a balanced table (common practice); a wage rise lifts every price.
    for (const s of p.sectors) {
      expect(s.base).toBeCloseTo(1, 12);
      expect(s.percent).toBeGreaterThan(0);
    }
    const e = JSON.parse((await run(['extract', fx.json, '--sector', 'S1', '--json'])).stdout);
    expect(e.extracted).toEqual(['S1']);
    expect(e.total.loss).toBeGreaterThan(1000);
    const each = JSON.parse((await run(['extract', fx.json, '--json'])).stdout);
    expect(each.sectors).toHaveLength(2);
    const csvOut = join(fx.dir, 'round.csv');
    expect((await run(['convert', fx.json, '--out', csvOut])).code).toBe(0);
    const back = JSON.parse((await run(['convert', csvOut, '--json'])).stdout);
    expect(back.table.sectors).toEqual({ codes: ['S1', 'S2'], labels: ['Agriculture', 'Manufacturing'] });
    expect(back.table.totalOutput).toBe(3000);
    const a = JSON.parse((await run(['aggregate', fx.json, '--concordance', fx.concordance, '--json'])).stdout);
    expect(a.table.sectors.codes).toEqual(['ALL']);
    expect(a.table.totalOutput).toBe(3000);
    const mapping = await run(['convert', fx.csv, '--print-mapping']);
    expect(JSON.parse(mapping.stdout).format).toBe('ripplewise-layout');
  });

  it('report writes HTML, XLSX, JSON and CSV at once, stating the inputs with their SHA-256', async () => {
    const outs = ['r.html', 'r.xlsx', 'r.json', 'r.csv'].map((n) => join(fx.dir, n));
    const r = await run(['report', fx.json, '--scenario', fx.scenario, ...outs.flatMap((o) => ['--out', o])]);
    expect(r.code).toBe(0);
    for (const o of outs) {
      expect(existsSync(o), o).toBe(true);
      expect(r.stderr).toContain(`wrote ${o}`);
    }
    const doc = JSON.parse(readFileSync(outs[2]!, 'utf8'));
    expect(doc.format).toBe('ripplewise-report');
    expect(doc.sections.map((s: { kind: string }) => s.kind)).toEqual(['comparison', 'scenario', 'scenario', 'multipliers', 'linkages', 'tornado', 'checks']);
    expect(doc.inputs.map((i: { role: string; sha256: string }) => [i.role, i.sha256])).toEqual([
      ['table', createHash('sha256').update(readFileSync(fx.json)).digest('hex')],
      ['scenarios', createHash('sha256').update(readFileSync(fx.scenario)).digest('hex')],
    ]);
    expect(doc.createdAt).toBe('2026-01-01T00:00:00.000Z');
    expect(doc.invented).toBe(false);
    const html = readFileSync(outs[0]!, 'utf8');
    expect(html).toContain(doc.inputs[0].sha256);
    expect(html).toContain('<svg');
  });
});

describe('the demo files', () => {
  it('the demo table as CSV and XLSX (written by src/io) reads back to the table of the JSON', async () => {
    // The whole table (every number, code, label, unit and metadata) as src/io's JSON writer writes it.
    const doc = (f: string) => run(['convert', f, '--format', 'json']).then((r) => JSON.parse(r.stdout));
    const [j, c, x] = await Promise.all(['data-demo/vellan-coast.table.json', 'data-demo/vellan-coast.csv', 'data-demo/vellan-coast.xlsx'].map(doc));
    expect(c).toEqual(j);
    expect(x).toEqual(j);
    const m = (f: string) => run(['multipliers', f, '--json']).then((r) => JSON.parse(r.stdout).measures);
    expect(await m('data-demo/vellan-coast.csv')).toEqual(await m('data-demo/vellan-coast.table.json'));
  });
});

describe('terminal behaviour', () => {
  it('colour only on a terminal and never with NO_COLOR', async () => {
    const tty = await run(['check', fx.bad], { stdoutTTY: true, stderrTTY: true });
    expect(tty.stdout).toMatch(/\u001b\[/);
    const no = await run(['check', fx.bad], { stdoutTTY: true, stderrTTY: true, env: { NO_COLOR: '1' } });
    expect(no.stdout).not.toMatch(/\u001b\[/);
    expect(no.stderr).not.toMatch(/\u001b\[/);
    const pipe = await run(['check', fx.bad]);
    expect(pipe.stdout).not.toMatch(/\u001b\[/);
    const err = await run(['check', 'missing.csv'], { stderrTTY: true, env: { NO_COLOR: '1' } });
    expect(err.stderr).not.toMatch(/\u001b\[/);
  });

  it('labels from a file cannot drive the terminal: control characters are shown, not sent', async () => {
    const table = structuredClone(TWO_SECTORS);
    table.sectors.labels = ['Agri\u001b]0;title\u0007culture', 'Manu\u001b[2J\rfacturing'];
    const file = join(fx.dir, 'controls.json');
    writeFileSync(file, JSON.stringify(table));
    for (const argv of [['multipliers', file], ['linkages', file], ['extract', file]]) {
      const r = await run(argv, { stdoutTTY: true });
      expect(r.code).toBe(0);
      expect(r.stdout).toContain('Agri\\x1b]0;title\\x07culture');
      expect(r.stdout).not.toMatch(/[\u0007\r]|\u001b\]|\u001b\[2J/);
    }
    const e = await run(['multipliers', file, '--measure', 'no\u001b[2Jsuch'], { stderrTTY: true });
    expect(e.code).toBe(2);
    expect(e.stderr).not.toMatch(/\u001b\[2J/);
  });

  it('a progress bar on standard error only when it is a terminal', async () => {
    const out = join(fx.dir, 'p.json');
    const tty = await run(['impact', fx.json, '--scenario', fx.scenario, '--out', out], { stderrTTY: true });
    expect(tty.code).toBe(0);
    expect(tty.stderr).toMatch(/impact .*\d\/5/);
    const pipe = await run(['impact', fx.json, '--scenario', fx.scenario, '--out', out]);
    expect(pipe.stderr).not.toMatch(/\d\/5/);
    expect(pipe.stderr).toMatch(/^wrote /);
    const json = await run(['impact', fx.json, '--scenario', fx.scenario, '--json'], { stderrTTY: true });
    expect(json.stderr).toBe('');
  });
});
