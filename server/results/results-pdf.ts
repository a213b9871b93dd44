/** The published sheet as a PDF (A4 or US Letter), generated on the server with pdfkit. */
import PDFDocument from 'pdfkit';
import { utcDateOf } from '../../common/calendar-date';
import { modelNote, varietyTestNote } from '../../common/contracts/analysis';
import {
  licenseLabels,
  interactionNote,
  sheetModel,
  sheetTraitDecimals,
  type ResultSnapshot,
} from '../../common/contracts/results';
import { displayUnit } from '../../common/display-units';
import { decimalsInUnit, displayNumber } from '../../common/precision';
import { designLabels } from '../../common/contracts/trials';
import { directionWords, rankMeans } from '../../common/ranking';

const fmt = displayNumber;

const beyondWinAnsi: Record<string, string> = {
  α: 'alpha',
  '−': '-',
  '≥': '>=',
  '≤': '<=',
  '√': 'sqrt',
};

export function forStandardFonts(text: string): string {
  return text.replace(/[α−≥≤√]/g, (c) => beyondWinAnsi[c] ?? c);
}

export interface PdfPhoto {
  entry: string;
  caption: string;
  jpeg: Buffer;
}

export function renderSheetPdf(
  s: ResultSnapshot,
  size: 'A4' | 'LETTER' = 'A4',
  photos: PdfPhoto[] = [],
): Promise<Buffer> {
  const doc = new PDFDocument({
    size,
    margin: 50,
    info: { Title: `${s.trial.title} — results, version ${s.version}`, Author: 'Rowtally' },
  });
  // The PDF's standard fonts cover Windows-1252 only: spell out the few symbols the sheet uses
  // beyond it, so every line prints as written.
  const write = doc.text.bind(doc);
  doc.text = ((value: unknown, ...rest: unknown[]) =>
    (write as (...a: unknown[]) => PDFKit.PDFDocument)(
      typeof value === 'string' ? forStandardFonts(value) : value,
      ...rest,
    )) as typeof doc.text;
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve) =>
    doc.on('end', () => resolve(Buffer.concat(chunks))),
  );

  doc.font('Helvetica-Bold').fontSize(18).fillColor('#1b3822').text(s.trial.title);
  doc
    .font('Helvetica')
    .fontSize(10)
    .fillColor('#6b4f36')
    .text(
      `${s.trial.crop} · ${s.trial.season} · ${designLabels[s.trial.design]} · version ${s.version}, published ${utcDateOf(s.publishedAt)}`,
    );
  if (s.changeNote) doc.text(`What changed: ${s.changeNote}`);
  doc.text(`Analysis: ${modelNote(sheetModel(s))}`);
  doc.moveDown();
  doc.fillColor('#1f2a1c');
  if (s.summary) doc.fontSize(11).text(s.summary).moveDown();

  doc.font('Helvetica-Bold').fontSize(13).text('Ranking across traits');
  doc.font('Helvetica').fontSize(10);
  for (const r of s.ranking) doc.text(`${r.rank}. ${r.variety}   (index ${fmt(r.index, 2)})`);
  doc.moveDown();

  for (const t of s.traits) {
    // The same display unit per trait as the web sheet (metric on paper), e.g. kg not g.
    const u = displayUnit(t.unit, 'metric', t.grandMean, t.displayUnit);
    const d = decimalsInUnit(sheetTraitDecimals(s, t).mean, u.factor);
    const v = (x: number | null | undefined) => fmt(x == null ? x : x * u.factor, d);
    const unit = u.label ? ` ${u.label}` : '';
    doc
      .font('Helvetica-Bold')
      .fontSize(12)
      .text(`${t.label}${u.label ? ` (${u.label})` : ''}, ${directionWords[t.direction]}`);
    doc
      .font('Helvetica')
      .fontSize(9)
      .fillColor('#6b4f36')
      .text(
        `Grand mean ${v(t.grandMean)}${unit}; CV ${fmt(t.cvPercent, 1)} %; ${s.letters === 'hsd' ? `Tukey HSD ${v(t.hsd.value)}` : `LSD ${v(t.lsd.value)}`} (α = ${s.alpha})`,
      );
    if (t.fixedTest) doc.text(varietyTestNote(t.fixedTest));
    if (t.varianceSummary) doc.text(t.varianceSummary);
    doc.fillColor('#1f2a1c').fontSize(10);
    for (const m of rankMeans(t.means, t.direction))
      doc.text(
        `${m.rank === null ? '' : `${m.rank}. `}${m.variety}   ${v(m.mean)} ± ${v(m.se)}${m.adjustedMean === undefined ? '' : ` (adjusted ${v(m.adjustedMean)} ± ${v(m.adjustedSe ?? null)})`}   ${m.group}`,
      );
    const two = t.twoFactor;
    if (two) {
      // Entries rank on their means over every level; the cells and the treatment follow.
      const interaction = interactionNote(t);
      doc
        .fontSize(9)
        .fillColor('#6b4f36')
        .text(`Entries ranked on their means over all levels of ${two.factor.toLowerCase()}.`)
        .text(two.strata);
      if (interaction) doc.text(interaction);
      doc
        .font('Helvetica-Bold')
        .fillColor('#1f2a1c')
        .text(`Cell means, variety × ${two.factor.toLowerCase()} (± SE)`)
        .font('Helvetica');
      for (const variety of t.means.map((m) => m.variety))
        doc.text(
          `${variety}   ${two.levels
            .map((level) => {
              const c = two.cellMeans.find((x) => x.variety === variety && x.treatment === level);
              return `${level}: ${c ? `${v(c.mean)} ± ${v(c.se)}` : '—'}`;
            })
            .join('   ')}`,
        );
      doc.text(
        `${two.factor} means: ${two.treatmentMeans.map((m) => `${m.treatment} ${v(m.mean)} ± ${v(m.se)}`).join('   ')}`,
      );
    }
    for (const w of t.warnings)
      doc.fontSize(8).fillColor('#a8631a').text(w).fillColor('#1f2a1c').fontSize(10);
    doc.moveDown(0.6);
  }
  doc
    .fontSize(9)
    .fillColor('#6b4f36')
    .text('Means followed by the same letter are not significantly different.')
    .moveDown();

  if (photos.length) {
    doc.addPage();
    doc.font('Helvetica-Bold').fontSize(12).fillColor('#1f2a1c').text('Photos');
    const width = (doc.page.width - doc.page.margins.left - doc.page.margins.right - 20) / 2;
    let column = 0;
    let top = doc.y + 6;
    for (const p of photos) {
      const x = doc.page.margins.left + column * (width + 20);
      if (top + width * 0.75 + 40 > doc.page.height - doc.page.margins.bottom) {
        doc.addPage();
        top = doc.page.margins.top;
      }
      doc.image(p.jpeg, x, top, { fit: [width, width * 0.75] });
      doc
        .font('Helvetica-Bold')
        .fontSize(9)
        .text(p.entry, x, top + width * 0.75 + 4, { width });
      doc.font('Helvetica').fontSize(8).text(p.caption, x, doc.y, { width });
      column = 1 - column;
      if (column === 0) top = doc.y + 14;
    }
    doc.x = doc.page.margins.left;
    doc.moveDown(2);
  }

  doc
    .font('Helvetica-Bold')
    .fontSize(12)
    .fillColor('#1f2a1c')
    .text('Methods', doc.page.margins.left);
  doc.font('Helvetica').fontSize(10).text(s.methods).moveDown();
  doc.font('Helvetica-Bold').fontSize(12).text('Growing conditions');
  doc.font('Helvetica').fontSize(10);
  for (const site of s.sites) {
    const parts = [
      site.region,
      site.soilTexture,
      site.irrigationMethod && `${site.irrigationMethod} irrigation`,
      site.rainMm !== null && `rain ${fmt(site.rainMm, 0)} mm`,
      site.irrigationMm !== null && `irrigation ${fmt(site.irrigationMm, 0)} mm`,
      site.degreeDays !== null &&
        `${fmt(site.degreeDays, 0)} degree days (base ${site.degreeDayBaseC} °C)`,
      site.hotDays !== null && `${site.hotDays} hot days`,
    ].filter(Boolean);
    doc.text(`${site.name}: ${parts.join(', ')}`);
  }
  const notes = s.entries.filter((e) => e.note);
  if (notes.length) {
    doc.moveDown().font('Helvetica-Bold').fontSize(12).text('Entry notes');
    doc.font('Helvetica').fontSize(10);
    for (const e of notes) doc.text(`${e.name}: ${e.note}${e.caution ? ` (${e.caution})` : ''}`);
  }
  for (const c of s.cautions)
    doc.moveDown(0.5).fontSize(9).fillColor('#b3261e').text(`Caution — ${c}`);
  doc
    .moveDown()
    .fontSize(8)
    .fillColor('#6b4f36')
    .text(`Licence: ${licenseLabels[s.license]}. Published with Rowtally.`);
  doc.end();
  return done;
}
