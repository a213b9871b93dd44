/**
 * npm run --silent analyze -- FILE.csv [--trait COLUMN] [--alpha 0.05] [--design crd|rcbd|multisite]
 *                                      [--letters hsd|lsd] [--direction higher|lower|none]
 *                                      [--model anova|mixed [--varieties-random]] [--factor COLUMN [--split-plot]]
 * Prints one JSON object on stdout; on bad input exits 1 with one line on stderr.
 */
import {
  AnalysisInputError,
  analyzeCsv,
  analyzeTwoFactorCsv,
  type AnalyzeOptions,
  type Design,
} from './engine/analyze.js';

// Built-ins taken as they are: an ES import of node:fs or node:util first copies every export,
// which loads the stream and MIME modules the command never uses (milliseconds at each start).
const { readFileSync } = process.getBuiltinModule('node:fs');
const { parseArgs } = process.getBuiltinModule('node:util');

const USAGE =
  'usage: analyze FILE.csv [--trait COLUMN] [--alpha 0.05] [--design crd|rcbd|multisite] [--letters hsd|lsd] [--direction higher|lower|none] [--model anova|mixed [--varieties-random]] [--factor COLUMN [--split-plot]]';

function fail(message: string, code = 1): never {
  process.stderr.write(message.replace(/\s*\n\s*/g, ' ') + '\n');
  process.exit(code);
}

function main(): void {
  let parsed;
  try {
    parsed = parseArgs({
      args: process.argv.slice(2),
      allowPositionals: true,
      strict: true,
      options: {
        trait: { type: 'string' },
        alpha: { type: 'string' },
        design: { type: 'string' },
        letters: { type: 'string' },
        direction: { type: 'string' },
        model: { type: 'string' },
        factor: { type: 'string' },
        'split-plot': { type: 'boolean' },
        'varieties-random': { type: 'boolean' },
      },
    });
  } catch (err) {
    fail(`${err instanceof Error ? err.message : String(err)}; ${USAGE}`, 2);
  }
  const { values, positionals } = parsed;
  if (positionals.length !== 1)
    fail(`expected one CSV file, got ${positionals.length}; ${USAGE}`, 2);
  const options: AnalyzeOptions = {};
  if (values.trait !== undefined) options.trait = values.trait;
  if (values.alpha !== undefined) {
    const a = Number(values.alpha);
    if (!/^\s*[0-9.eE+-]+\s*$/.test(values.alpha) || !(a > 0 && a < 1)) {
      fail(`option --alpha: "${values.alpha}" is not a number between 0 and 1`, 2);
    }
    options.alpha = a;
  }
  if (values.design !== undefined) {
    if (!['crd', 'rcbd', 'multisite'].includes(values.design)) {
      fail(`option --design: "${values.design}" is not one of crd, rcbd, multisite`, 2);
    }
    options.design = values.design as Design;
  }
  if (values.letters !== undefined) {
    if (values.letters !== 'hsd' && values.letters !== 'lsd')
      fail(`option --letters: "${values.letters}" is not hsd or lsd`, 2);
    options.letters = values.letters;
  }
  if (values.direction !== undefined) {
    // Which way is better: rank 1 goes to the best mean (default higher).
    if (!['higher', 'lower', 'none'].includes(values.direction))
      fail(`option --direction: "${values.direction}" is not higher, lower or none`, 2);
    options.direction = values.direction as 'higher' | 'lower' | 'none';
  }
  if (values.model !== undefined) {
    if (values.model !== 'anova' && values.model !== 'mixed')
      fail(`option --model: "${values.model}" is not anova or mixed`, 2);
    options.model = values.model;
  }
  if (values['varieties-random']) {
    // Heritability and BLUPs come from a second REML fit with varieties random.
    if (options.model !== 'mixed') fail('option --varieties-random: needs --model mixed', 2);
    options.varietiesRandom = true;
  }
  const file = positionals[0]!;
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code ?? 'error';
    fail(`${file}: cannot read file (${code})`);
  }
  if (values['split-plot'] && values.factor === undefined)
    fail('option --split-plot: name the treatment column with --factor', 2);
  try {
    // --factor: a treatment × variety trial in blocks (a split plot with --split-plot).
    const result =
      values.factor === undefined
        ? analyzeCsv(text, options)
        : analyzeTwoFactorCsv(text, {
            ...options,
            factor: values.factor,
            splitPlot: values['split-plot'] ?? false,
          });
    process.stdout.write(
      JSON.stringify(result, (_k, v: unknown) =>
        typeof v === 'number' && !Number.isFinite(v) ? null : v,
      ) + '\n',
    );
  } catch (err) {
    if (err instanceof AnalysisInputError) fail(`${file}: ${err.message}`);
    fail(`${file}: analysis failed: ${err instanceof Error ? err.message : String(err)}`);
  }
}

main();
