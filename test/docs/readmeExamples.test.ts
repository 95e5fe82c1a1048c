/** The README's examples stay true: its spec outline is a valid spec. Project rule (no source). */
import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { parseSpec } from '../../src/design/index.js';

describe('README examples', () => {
  it('gives a spec outline that validates as written', () => {
    const readme = readFileSync('README.md', 'utf8');
    const start = readme.indexOf('```yaml\nformat: 1');
    expect(start).toBeGreaterThan(0);
    const text = readme.slice(start + '```yaml\n'.length, readme.indexOf('```', start + 7));
    const spec = parseSpec(text, 'README.md');
    expect(spec.name).toBe('FH-210 Kestrel VCO');
  });

  it('keeps the two quick-start commands', () => {
    const readme = readFileSync('README.md', 'utf8');
    expect(readme).toContain('npm ci && npm run demo');
    expect(readme).toContain('npm test');
  });
});
