/** The calibration section of the Markdown unit record: per run and iteration, figures, guidance and steps. */
import type { StoredCalibrationIteration, StoredCalibrationRun, UnitRecord } from '../types/index.js';
import { iterationNotes, trimText } from './trimText.js';
import { STATEMENT_WORDS } from '../types/index.js';
import { STEP_HEAD, figurePairs, lawText, limitsText, outcomeText, stepCells } from './calibrationFormat.js';
import { md, mdTable } from './recordMarkdown.js';
import { formatTime } from './reportNumbers.js';

export function renderCalibrationMarkdown(rec: UnitRecord): string {
  const runs = rec.calibrations ?? [];
  if (runs.length === 0) return '';
  const head = rec.runs.length === 0 ? `# Test record — unit ${md(rec.unit)}\n\nNo check runs stored yet: only calibration runs.\n\n` : '';
  return `${head}## Calibration runs\n\nTracking plots: \`--format html\`.\n\n${[...runs].reverse().map(runMarkdown).join('\n\n')}`;
}

function runMarkdown(run: StoredCalibrationRun): string {
  const first = run.iterations[0]?.result;
  const lines = [
    `### Calibration run #${run.id} — ${run.complete ? 'complete' : 'open'}`,
    '',
    `- started ${formatTime(run.startedAt)}; spec ${md(run.spec.name)}, revision ${md(run.spec.revision)}; ${run.iterations.length} iteration(s)`,
    ...(first ? [`- law: ${md(lawText(first.law))}; ${md(limitsText(first.limits))}`] : []),
  ];
  return [lines.join('\n'), ...run.iterations.map(iterationMarkdown)].join('\n\n');
}

function iterationMarkdown(s: StoredCalibrationIteration): string {
  const it = s.result;
  const title = `#### Iteration ${s.number}${it.label ? ` “${md(it.label)}”` : ''} — **${STATEMENT_WORDS[it.statement]}**${s.intact ? '' : ' (**CHANGED** since stored)'}`;
  const figures = figurePairs(it).map(([k, v]) => `- ${k}: ${md(v)}`);
  const guidance = it.guidance.map((g) => `- ${md(trimText(g))}`);
  const rows = it.steps.map((st) => [...stepCells(st, it.law).map(md), st.statement ? STATEMENT_WORDS[st.statement] : 'no limit']);
  return [
    title,
    `${formatTime(s.startedAt)}, ${md(s.operator)}, ${md(s.station)}: ${md(outcomeText(it))}`,
    it.note !== undefined ? `What was done before it: ${md(it.note)}` : '',
    figures.join('\n'),
    guidance.length ? `Trim guidance:\n\n${guidance.join('\n')}` : '',
    ...iterationNotes(it).map((n) => `_${md(n)}_`),
    mdTable([...STEP_HEAD, 'statement'], rows),
  ]
    .filter((x) => x !== '')
    .join('\n\n');
}
