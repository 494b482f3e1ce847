/**
 * The lease report as a PDF built in the browser with jsPDF (loaded only when asked for):
 * the lease, its yearly rating, the rating per flood, the reasons, the inputs and the cautions, plus the map
 * image when there is one. Text stays uncompressed so it can be searched and checked.
 */
import type { Lease } from '#shared/schemas/lease';
import { annualRatingRuleLines } from '#shared/scoring/annual-rating';
import { chanceWords, closureDaysWords } from '../../../components/ui/annual-rating';
import { CAUTION_TEXT } from '../../../components/ui/cautions';
import { RATING_LABEL } from '../../../components/ui/rating-badge';
import type { ScreeningRow } from '../../../lib/exposure-api';
import { fmtArea, fmtFlow, fmtIndicator, fmtNumber, fmtPercent, fmtSalinity, speciesName } from '../../../lib/format';

export interface ReportInput {
  lease: Lease;
  riverName: string;
  rows: ScreeningRow[];
  selected: ScreeningRow | undefined;
  speciesBand?: string;
  inputs: [string, string][];
  map: { dataUrl: string; width: number; height: number } | null;
}

/** The standard PDF fonts are Latin-1 only: swap the few characters they cannot draw. */
function plain(text: string): string {
  return text
    .replace(/[‐-―]/g, '-')
    .replace(/[‘’]/g, "'")
    .replace(/[“”]/g, '"')
    .replace(/…/g, '...')
    .replace(/≥/g, '>=')
    .replace(/≤/g, '<=')
    .replace(/[^\x20-\xff\n]/g, '');
}

export async function buildLeaseReportPdf(input: ReportInput): Promise<Blob> {
  const { jsPDF } = await import('jspdf');
  const doc = new jsPDF({ unit: 'mm', format: 'a4', compress: false });
  const left = 16;
  const width = 210 - 2 * left;
  const bottom = 297 - 16;
  let y = 18;

  const ensure = (h: number) => {
    if (y + h > bottom) {
      doc.addPage();
      y = 18;
    }
  };
  const heading = (text: string) => {
    ensure(12);
    y += 3;
    doc.setFont('helvetica', 'bold').setFontSize(12).text(plain(text), left, y);
    y += 6;
  };
  const para = (text: string, size = 9.5, style: 'normal' | 'bold' = 'normal') => {
    doc.setFont('helvetica', style).setFontSize(size);
    const lines = doc.splitTextToSize(plain(text), width) as string[];
    for (const line of lines) {
      ensure(size * 0.45);
      doc.text(line, left, y);
      y += size * 0.45;
    }
    y += 1.5;
  };

  const { lease, rows, selected } = input;
  doc
    .setFont('helvetica', 'bold')
    .setFontSize(17)
    .text(plain(`Lease ${lease.leaseId}: exposure to flood water`), left, y);
  y += 7;
  doc.setFont('helvetica', 'normal').setFontSize(9).setTextColor(80);
  doc.text(plain(`Brackline screening report, ${input.riverName}, made ${new Date().toISOString().slice(0, 10)}`), left, y);
  doc.setTextColor(0);
  y += 7;

  const facts: [string, string][] = [
    ['Lease id', lease.leaseId],
    ['Holder', lease.holder ?? '-'],
    ['Species', speciesName(lease.species)],
    ['Status', lease.status === 'held' ? 'Held' : 'Candidate'],
    ['Area', fmtArea(lease.areaM2)],
  ];
  for (const [k, v] of facts) {
    doc.setFont('helvetica', 'bold').setFontSize(9.5).text(plain(k), left, y);
    doc.setFont('helvetica', 'normal').text(plain(v), left + 28, y);
    y += 4.6;
  }

  // The yearly headline a grower or a lender decides on, with the rule that sets it.
  if (lease.annualRating) {
    heading(`Yearly rating, every river: ${RATING_LABEL[lease.annualRating]}`);
    para(
      `${closureDaysWords(lease.closureDaysPerYear)} a year with the faecal indicator above the standard (expected); chance a year of a salinity event harmful to ${speciesName(lease.species).toLowerCase()}: ${chanceWords(lease.harmfulSalinityChancePerYear).toLowerCase()}.`,
    );
    para(`How the yearly rating is set: ${annualRatingRuleLines().join(' ')}`, 8.5);
  }

  if (input.map) {
    const w = width;
    const h = Math.min(90, (w * input.map.height) / input.map.width);
    ensure(h + 8);
    y += 2;
    doc.addImage(input.map.dataUrl, 'PNG', left, y, w, h);
    y += h + 2;
    doc
      .setFontSize(8)
      .setTextColor(80)
      .text(plain(`Map: the lease (black outline) and the plume bands of ${selected?.scenarioName ?? 'the chosen flood'}.`), left, y + 2);
    doc.setTextColor(0);
    y += 6;
  }

  heading('Rating for each flood');
  const cols = [
    { title: 'Flood', w: 58 },
    { title: 'Rating', w: 18 },
    { title: 'Under limit', w: 18 },
    { title: 'In plume', w: 16 },
    { title: 'Lowest salinity', w: 24 },
    { title: 'Highest indicator', w: 28 },
    { title: 'Days below', w: 16 },
  ];
  const row = (cells: string[], bold = false) => {
    doc.setFont('helvetica', bold ? 'bold' : 'normal').setFontSize(8);
    const wrapped = cells.map((c, i) => doc.splitTextToSize(plain(c), cols[i].w - 2) as string[]);
    const h = Math.max(...wrapped.map((w) => w.length)) * 3.6 + 1.4;
    ensure(h);
    let x = left;
    wrapped.forEach((lines, i) => {
      doc.text(lines, x, y);
      x += cols[i].w;
    });
    y += h;
    doc.setDrawColor(200).line(left, y - 2.4, left + width, y - 2.4);
  };
  row(
    cols.map((c) => c.title),
    true,
  );
  for (const r of rows) {
    row([
      `${r.scenarioName}, ${fmtFlow(r.discharge)}, ${fmtNumber(r.durationHours / 24, 1)} d`,
      RATING_LABEL[r.rating],
      fmtPercent(r.bandFractions[input.speciesBand ?? ''] ?? 0),
      fmtPercent(r.bandFractions['plume-edge'] ?? 0),
      fmtSalinity(r.lowestSalinity),
      fmtIndicator(r.highestIndicator),
      r.daysBelowTolerance === null ? '-' : fmtNumber(r.daysBelowTolerance, 1),
    ]);
  }

  if (selected) {
    heading(`Why ${RATING_LABEL[selected.rating]} at the ${selected.scenarioName}`);
    for (const reason of selected.reasons) para(`- ${reason}`);
  }

  heading('Inputs');
  for (const [k, v] of input.inputs) para(`${k}: ${v}`, 9);

  heading('Cautions');
  for (const line of CAUTION_TEXT) para(line, 9);
  para('Brackline predicts; the shellfish control authority decides. Nothing in this report says a lease is fit for harvest.', 9, 'bold');

  return doc.output('blob');
}
