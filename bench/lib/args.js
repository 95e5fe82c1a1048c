// Command-line flags of the benchmark harness (`npm run bench -- --sizes 100k,1M --runs 3`).

export const DEFAULT_SIZES = [1_000_000, 4_000_000, 10_000_000];

/** "100k" → 100000, "1M" → 1000000, "2500000" → 2500000; throws RangeError on anything else. */
export function parseSize(text) {
  const m = /^\s*(\d+(?:\.\d+)?)\s*([kKmM]?)\s*$/.exec(String(text));
  if (!m) throw new RangeError(`size "${text}" is not a row count like 100k, 1M or 250000`);
  const scale = m[2] === '' ? 1 : m[2].toLowerCase() === 'k' ? 1e3 : 1e6;
  const rows = Math.round(Number(m[1]) * scale);
  if (rows < 1000) throw new RangeError(`size "${text}" is below 1000 rows`);
  return rows;
}

/** 1000000 → "1M", 100000 → "100k", 2500000 → "2.5M". */
export function sizeLabel(rows) {
  if (rows >= 1e6) return `${+(rows / 1e6).toFixed(3)}M`;
  if (rows >= 1e3) return `${+(rows / 1e3).toFixed(3)}k`;
  return String(rows);
}

const HELP = `npm run bench -- [options]

Times benchproof against the numpy/pandas peer script on generated captures.

  --sizes LIST     row counts, comma separated (default 1M,4M,10M), e.g. 100k,1M
  --runs N         whole-process runs per file and tool (default 5 up to 1M rows, 3 above)
  --no-peer        do not run the peer script
  --no-synth       only the gen_capture.py files (skip the synthesizer's captures)
  --regenerate     write the capture files again even when cached in bench/data/
  --no-page        skip the bench page's timings (bench/serve.js) at the end
  --strict         exit 1 when a target fails
  -h, --help       this text

Examples:
  npm run bench -- --sizes 100k,1M --runs 3
  node bench/run.js --sizes 1M --no-synth
`;

export function parseArgs(argv) {
  const opts = { sizes: DEFAULT_SIZES, runs: null, peer: true, synth: true, page: true, regenerate: false, strict: false, help: false };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    const value = () => {
      const eq = a.indexOf('=');
      if (eq >= 0) return a.slice(eq + 1);
      if (i + 1 >= argv.length) throw new RangeError(`${a} needs a value`);
      return argv[++i];
    };
    const name = a.split('=')[0];
    if (name === '--sizes') opts.sizes = value().split(',').filter(Boolean).map(parseSize);
    else if (name === '--runs') {
      const n = Number(value());
      if (!Number.isInteger(n) || n < 1) throw new RangeError(`--runs needs a whole number ≥ 1, got ${argv[i]}`);
      opts.runs = n;
    } else if (a === '--no-peer') opts.peer = false;
    else if (a === '--no-synth') opts.synth = false;
    else if (a === '--no-page') opts.page = false;
    else if (a === '--regenerate') opts.regenerate = true;
    else if (a === '--strict') opts.strict = true;
    else if (a === '-h' || a === '--help') opts.help = true;
    else throw new RangeError(`unknown option ${a} (see --help)`);
  }
  opts.sizes = [...new Set(opts.sizes)].sort((x, y) => x - y);
  return opts;
}

export function helpText() {
  return HELP;
}

/** Runs per file: several, fewer for the big files that take seconds each. */
export function runsFor(rows, requested) {
  if (requested) return requested;
  return rows <= 1_000_000 ? 5 : 3;
}
