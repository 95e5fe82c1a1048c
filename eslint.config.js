// Lint: TypeScript rules plus one architectural rule: imports flow one way between stages
// (capture → analysis → design → diagnose → records → report; cli and server wire them; types and syntheticCaptures are shared).
import js from '@eslint/js';
import tseslint from 'typescript-eslint';

const order = ['capture', 'analysis', 'design', 'diagnose', 'records', 'report'];
const later = (stage) => order.slice(order.indexOf(stage) + 1);
const patternsFor = (stage) => [
  ...later(stage).map((s) => ({ group: [`**/${s}/**`, `../${s}/*`, `../${s}/index.js`], message: `${stage} may not import from the later stage ${s}` })),
  { group: ['**/cli/**', '../cli/*'], message: 'no stage imports the command line' },
  { group: ['**/server/**', '../server/*'], message: 'no stage imports the bench page server' },
];
const inner = (stage) => ({
  regex: '^(\\.\\./)+(capture|analysis|design|diagnose|records|report|syntheticCaptures|types)/(?!index\\.js$).+',
  message: `import another stage through its index.ts only (${stage})`,
});

export default tseslint.config(
  { ignores: ['dist/**', 'node_modules/**', 'bench/data/**', 'benchproof-data/**'] },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  ...order.map((stage) => ({
    files: [`src/${stage}/**/*.ts`],
    rules: {
      'no-restricted-imports': ['error', { patterns: [...patternsFor(stage), inner(stage)] }],
    },
  })),
  {
    files: ['src/cli/**/*.ts'],
    rules: { 'no-restricted-imports': ['error', { patterns: [inner('cli')] }] },
  },
  {
    // The bench page server wires like src/cli: stages through their index, cli helpers directly.
    files: ['src/server/**/*.ts'],
    rules: { 'no-restricted-imports': ['error', { patterns: [inner('server')] }] },
  },
  {
    files: ['src/analysis/**/*.ts'],
    rules: {
      'no-restricted-imports': [
        'error',
        {
          paths: [
            { name: 'node:fs', message: 'analysis never does I/O' },
            { name: 'fs', message: 'analysis never does I/O' },
            { name: 'node:fs/promises', message: 'analysis never does I/O' },
          ],
          patterns: [...patternsFor('analysis'), inner('analysis')],
        },
      ],
      'no-restricted-properties': ['error', { object: 'Math', property: 'random', message: 'take a seeded generator' }],
      'no-console': 'error',
    },
  },
  {
    rules: {
      '@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
    },
  },
);
