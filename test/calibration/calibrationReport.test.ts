import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { openStore } from '../../src/records/index.js';
import { createStyle, renderCalibrationText, renderRecordHtml, renderRecordJson, renderRecordMarkdown, renderTrackingSvg } from '../../src/report/index.js';
import type { StoredCalibrationRun, UnitRecord } from '../../src/types/index.js';
import { kestrelRun } from '../records/fixtures/kestrelRun.js';
import { makeTempDir, removeTempDir } from '../records/helpers/tempData.js';
import { calibrationIteration } from './calibrationIterations.js';

let root: string;
let rec: UnitRecord;
beforeEach(() => {
  root = makeTempDir();
  const store = openStore(join(root, 'data'));
  store.saveRun(kestrelRun({ unit: 'FK-0104', startedAt: '2026-03-03T11:00:00.000Z', frequencyScale: 0.943 }));
  store.saveCalibration(calibrationIteration('FK-0104', '2026-03-03T10:00:00.000Z', 0.987, -100.9, 'as found'));
  store.saveCalibration(calibrationIteration('FK-0104', '2026-03-03T10:20:00.000Z', 1, 0.4, 'after trims'));
  rec = store.unitRecord('FK-0104')!;
  store.close();
});
afterEach(() => removeTempDir(root));

describe('calibration in the unit record', () => {
  it('the HTML record has a tracking SVG with one line per iteration and the limit band', () => {
    const html = renderRecordHtml(rec);
    const svg = /<svg class="plot tracking"[\s\S]*?<\/svg>/.exec(html)?.[0] ?? '';
    expect(svg).not.toBe('');
    expect(svg.match(/<g data-iteration="\d+">/g)).toHaveLength(2);
    expect(svg).toMatch(/±5 cents/);
    expect(svg).toMatch(/#2 after trims/);
    expect(html).toMatch(/<section id="calibration">/);
    expect(html).toMatch(/scale: raise by 1\.3 %/);
    // The check sections are still there, before the calibration section.
    expect(html.indexOf('id="results"')).toBeLessThan(html.indexOf('id="calibration"'));
  });

  it('the HTML record of a unit only calibrated shows the calibration section alone', () => {
    const only: UnitRecord = { ...rec, runs: [], status: 'not-measured' };
    const html = renderRecordHtml(only);
    expect(html).toMatch(/No check runs stored yet/);
    expect(html).not.toMatch(/id="results"/);
  });

  it('the Markdown record lists every iteration with its guidance and step table', () => {
    const md = renderRecordMarkdown(rec);
    expect(md).toMatch(/## Calibration runs/);
    expect(md).toMatch(/#### Iteration 1 “as found” — \*\*FAIL\*\*/);
    expect(md).toMatch(/#### Iteration 2 “after trims” — \*\*PASS\*\*/);
    expect(md).toMatch(/\| 5 \| 5 V \|/);
  });

  it('the JSON record carries the calibration runs and reads back to the same objects', () => {
    const back = JSON.parse(renderRecordJson(rec)) as UnitRecord;
    expect(back.calibrations).toEqual(rec.calibrations);
  });

  it('the tracking plot breaks its line at a step that was not measured', () => {
    const run = rec.calibrations![0];
    const gap: StoredCalibrationRun = {
      ...run,
      iterations: [{ ...run.iterations[0], result: { ...run.iterations[0].result, steps: run.iterations[0].result.steps.map((s, i) => (i === 2 ? { ...s, cents: null } : s)) } }],
    };
    expect(renderTrackingSvg(gap).match(/<polyline/g)).toHaveLength(2);
  });

  it('the terminal text gives each step, the figures, the guidance and the outcome in words', () => {
    const text = renderCalibrationText(rec.calibrations![0].iterations[0].result, createStyle(false), { calibrationId: 1, number: 1, startedRun: true });
    expect(text).toMatch(/iteration 1 of calibration run #1/);
    expect(text).toMatch(/fitted scale {2}0\.98700\d* ± 0\.0000\d+ octave\/V, i\.e\. −15\.6 cents per octave/);
    expect(text).toMatch(/scale: raise by 1\.3 %/);
    expect(text).toMatch(/FK-0104: FAIL {2}does not meet the calibration limits: 6 of 6 steps outside ±5 cents/);
  });
});
