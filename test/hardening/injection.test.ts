/**
 * Injection, seeded: hostile text (terminal escape sequences, carriage returns and other control
 * characters, bidirectional overrides, Markdown table and emphasis syntax, raw HTML, spreadsheet
 * formula prefixes) placed in an operator name, a capture file name, the data folder's path and the
 * spec's name, then stored by `check` and read back by `units`, `record` (Markdown, HTML) and `batch`
 * (Markdown, CSV). Counted as "injected" when any of it reaches an output raw: a control character in
 * text meant for a terminal (ECMA-48 C0/C1), a Markdown table row split or raw HTML formed (GitHub
 * Flavored Markdown §4.10, CommonMark §6.6), an HTML tag of the payload unescaped, or a CSV text cell
 * a spreadsheet would run as a formula (OWASP "CSV Injection"). Project rule otherwise (no source).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { copyFileSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import fc from 'fast-check';
import { runCli } from '../helpers/cliHarness.js';
import { newTally, saveTally, scaled, seedFor } from './budget.js';

const tally = newTally();
const work = mkdtempSync(join(tmpdir(), 'benchproof-inject-'));
afterAll(() => {
  saveTally('injection', tally);
  rmSync(work, { recursive: true, force: true });
});

const SAMPLES = resolve('samples/captures');
const SPEC_TEXT = readFileSync(resolve('samples/fh210-spec.yaml'), 'utf8');
const PIECES = ['\x1b]0;owned\x07', '\x1b[2J', '\x1b[31m', '\r', '\n', '\u0085', '\u202e', '\x07', '\x00', '|', '`', '<script>alert(7)</script>', '<img src=x onerror=alert(7)>', '**', '[a](b)', ' =1+1', '+SUM(A1)', '@cmd', '\t=2', 'FK', ' ', 'é', '&lt;b&gt;'];
const hostile = fc.array(fc.constantFrom(...PIECES), { minLength: 1, maxLength: 5 }).map((parts) => parts.join(''));
// eslint-disable-next-line no-control-regex -- finding control characters is the point
const RAW_CONTROL = /[\u0000-\u0008\u000b-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]/;
const RAW_TAG = /<(script|img)[ >]/i;

function injected(what: string, detail: string): void {
  tally.injected = (tally.injected ?? 0) + 1;
  tally.notes.push(`${what}: ${JSON.stringify(detail.slice(0, 120))}`);
}

/** Table rows of one Markdown document split by an unescaped `|`: each table keeps its header's cell count. */
function brokenRows(md: string): string[] {
  const cells = (l: string): number => l.replace(/\\\\/g, '').replace(/\\\|/g, '').split('|').length;
  const bad: string[] = [];
  let width = 0;
  for (const line of md.split('\n')) {
    if (!line.startsWith('|')) {
      width = 0;
      continue;
    }
    if (width === 0) width = cells(line);
    else if (cells(line) !== width) bad.push(line);
  }
  return bad;
}

/** RFC 4180 text cells of a CSV document. */
function csvCells(csv: string): string[] {
  const out: string[] = [];
  let cell = '';
  let quoted = false;
  for (let i = 0; i < csv.length; i++) {
    const c = csv[i];
    if (quoted) {
      if (c === '"' && csv[i + 1] === '"') {
        cell += '"';
        i++;
      } else if (c === '"') quoted = false;
      else cell += c;
    } else if (c === '"') quoted = true;
    else if (c === ',' || c === '\n') {
      out.push(cell.replace(/\r$/, ''));
      cell = '';
    }
    else cell += c;
  }
  return out;
}

describe('hostile text in names and strings', () => {
  it('never reaches a terminal, Markdown, HTML or CSV output raw, seeded', async () => {
    let i = 0;
    let read = 0;
    await fc.assert(
      fc.asyncProperty(hostile, hostile, hostile, hostile, async (operator, fileBit, folderBit, specName) => {
        const dir = join(work, `c${i++}`);
        mkdirSync(dir);
        // eslint-disable-next-line no-control-regex -- finding control characters is the point
        const folder = folderBit.replace(/[\u0000/]/g, '_');
        const data = join(dir, `data ${folder}`);
        // eslint-disable-next-line no-control-regex -- finding control characters is the point
        const file = join(dir, `FK-0101${fileBit.replace(/[\u0000/]/g, '_')}_mid.csv`);
        copyFileSync(join(SAMPLES, 'FK-0101_mid.csv'), file);
        const spec = join(dir, 'spec.yaml');
        writeFileSync(spec, SPEC_TEXT.replace('name: FH-210 Kestrel VCO', `name: ${JSON.stringify(`K ${specName}`)}`));
        const env = { NO_COLOR: '1' };
        const runs = [
          await runCli(['check', file, '--spec', spec, '--unit', 'FK-0101', '--condition', 'mid', '--operator', `op ${operator}`, '--data', data], { cwd: dir, env }),
          await runCli(['units', '--data', data], { cwd: dir, env }),
          await runCli(['record', 'FK-0101', '--data', data], { cwd: dir, env }),
          await runCli(['record', 'FK-0101', '--format', 'html', '--data', data], { cwd: dir, env }),
          await runCli(['batch', '--data', data], { cwd: dir, env }),
          await runCli(['batch', '--format', 'csv', '--data', data], { cwd: dir, env }),
        ];
        tally.inputs += runs.length;
        const [check, units, md, html, batchMd, csv] = runs;
        for (const [n, r] of runs.entries()) {
          if (r.code === 3) {
            tally.crashes++;
            tally.notes.push(`internal error (command ${n}): ${r.stderr.split('\n')[0]}`);
          }
        }
        // A spec name the spec stage refuses (e.g. a control character YAML will not take) is a clean refusal.
        if (check.code === 2) return;
        read++;
        for (const [what, text] of [['check', check.stdout + check.stderr], ['units', units.stdout + units.stderr], ['record stderr', md.stderr + html.stderr]] as const) {
          // A line break in a name (LF, or CR LF, which a terminal shows the same) may split a line
          // of terminal text; it cannot overwrite or control the terminal, so it is not counted.
          const m = RAW_CONTROL.exec(text.replace(/\r\n/g, '\n'));
          if (m) injected(`${what}: raw control character`, text.slice(Math.max(0, m.index - 20), m.index + 20));
        }
        for (const [what, text] of [['record md', md.stdout], ['batch md', batchMd.stdout]] as const) {
          // eslint-disable-next-line no-control-regex -- finding control characters is the point
          if (/[\r\u0000-\u0008\u000b-\u001f\u007f-\u009f]/.test(text)) injected(`${what}: raw control character`, text);
          for (const row of brokenRows(text)) injected(`${what}: table row split`, row);
          const tag = /(^|[^\\])<([a-z]+)/i.exec(text);
          if (tag) injected(`${what}: raw HTML`, text.slice(tag.index, tag.index + 40));
        }
        const tag = RAW_TAG.exec(html.stdout);
        if (tag) injected('record html: payload tag', html.stdout.slice(tag.index, tag.index + 40));
        for (const cell of csvCells(csv.stdout)) {
          if (/^[\s\u00a0]*[=+@]/.test(cell) || /^[\s\u00a0]*-[^\d.]/.test(cell) || /^[\t\r]/.test(cell)) injected('batch csv: formula cell', cell);
        }
        expect(tally.injected ?? 0, tally.notes.join('\n')).toBe(0);
        rmSync(dir, { recursive: true, force: true });
      }),
      { seed: seedFor(41), numRuns: scaled(6, 150) },
    );
    expect(tally.crashes, tally.notes.join('\n')).toBe(0);
    // Most cases must get through to the reports, or the property checks nothing.
    expect(read).toBeGreaterThan(0);
  }, scaled(120_000, 60 * 60_000));
});
