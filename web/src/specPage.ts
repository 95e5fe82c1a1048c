// The spec page: the current spec, validated as `benchproof spec validate` does; a valid spec shows
// the line that command prints and the text, an invalid one every problem with its path and line.
import type { BenchErrorView } from './api.js';
import { getJson } from './api.js';
import { h } from './dom.js';

interface SpecView {
  readonly file: string | null;
  readonly valid: boolean;
  readonly summary?: string;
  readonly text?: string;
  readonly error?: BenchErrorView | null;
}

export function showSpec(main: HTMLElement): () => void {
  const body = h('div', { class: 'spec' }, h('p', {}, 'Reading the spec…'));
  main.append(h('h1', {}, 'Spec'), body);
  void getJson<SpecView>('/api/spec').then((s) => {
    if (s.file === null) return body.replaceChildren(h('p', {}, 'No spec was given: start benchproof serve with --spec FILE to check dropped captures.'));
    if (!s.valid) return body.replaceChildren(h('p', {}, h('code', {}, s.file), ' has problems; captures are not checked until it is fixed:'), h('pre', { class: 'error', role: 'alert', id: 'spec-problems' }, s.error?.message ?? s.error?.problem ?? ''));
    return body.replaceChildren(h('p', { class: 'valid', id: 'spec-summary' }, s.summary ?? ''), h('pre', { class: 'spec-text', tabindex: '0', 'aria-label': 'Spec text' }, s.text ?? ''));
  });
  return () => {};
}
