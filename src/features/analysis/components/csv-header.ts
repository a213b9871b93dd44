/** The header cells of CSV text (first record; quoted cells and "" escapes understood). */
export function csvHeader(text: string): string[] {
  const src = text.replace(/^\uFEFF/, '');
  const cells: string[] = [];
  let cur = '';
  let quoted = false;
  for (let i = 0; i < src.length; i++) {
    const ch = src[i]!;
    if (quoted) {
      if (ch === '"' && src[i + 1] === '"') {
        cur += '"';
        i++;
      } else if (ch === '"') quoted = false;
      else cur += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === ',') {
      cells.push(cur.trim());
      cur = '';
    } else if (ch === '\n' || ch === '\r') break;
    else cur += ch;
  }
  cells.push(cur.trim());
  return cells.filter((c, i) => c !== '' || i < cells.length - 1);
}

const guesses: Record<'variety' | 'site' | 'block' | 'plot', RegExp> = {
  variety: /^(variety|entry|cultivar|line|genotype|treatment)/i,
  site: /^(site|location|garden|farm|place)/i,
  block: /^(block|rep|replicate)/i,
  plot: /^(plot)/i,
};

/** A first guess at which header cell plays each layout role. */
export function guessColumns(header: string[]) {
  const used = new Set<string>();
  const pick = (p: RegExp) => {
    const h = header.find((c) => p.test(c) && !used.has(c));
    if (h) used.add(h);
    return h ?? '';
  };
  const variety = pick(guesses.variety);
  const site = pick(guesses.site);
  const block = pick(guesses.block);
  const plot = pick(guesses.plot);
  const value = header.find((c) => !used.has(c)) ?? '';
  return { variety, site, block, plot, value };
}
