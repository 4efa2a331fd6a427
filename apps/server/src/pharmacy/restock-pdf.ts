import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { DISCREPANCY_WORDS, expiryNote, restockRows, type ReconciledDrug } from '@steadyhand/shared';
import type { Content, TableCell, TDocumentDefinitions } from 'pdfmake/interfaces.js';

const require = createRequire(import.meta.url);
type Pdfmake = typeof import('pdfmake');
// pdfmake 0.3 exports one shared instance; the records PDF configures that one, so the restock
// list uses its own (same class) and neither can change the other's fonts or access policies.
const shared = require('pdfmake') as Pdfmake;
const pdfmake = new (shared as unknown as { constructor: new () => Pdfmake }).constructor();

let configured = false;
function configure(): void {
  if (configured) return;
  // Fonts go through pdfmake's in-memory file system, so it never opens a path itself and the
  // local access policy can refuse every file.
  const vfs = (pdfmake as unknown as { virtualfs: { writeFileSync(name: string, data: Buffer): void } }).virtualfs;
  const font = (weight: 400 | 700) => {
    const name = `steadyhand-restock/atkinson-hyperlegible-${weight}.woff`;
    vfs.writeFileSync(name, readFileSync(require.resolve(`@fontsource/atkinson-hyperlegible/files/atkinson-hyperlegible-latin-${weight}-normal.woff`)));
    return name;
  };
  const regular = font(400);
  const bold = font(700);
  pdfmake.addFonts({ Atkinson: { normal: regular, bold, italics: regular, bolditalics: bold } });
  pdfmake.setUrlAccessPolicy(() => false);
  pdfmake.setLocalAccessPolicy(() => false);
  configured = true;
}

export interface RestockPdfInput {
  facility: string;
  unitName: string;
  trayName: string;
  codeId: string;
  arrestAt: string;
  location: string | null;
  status: string;
  rows: ReconciledDrug[];
  printedAt: string;
}

const when = (iso: string) => `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC`;

export async function renderRestockPdf(input: RestockPdfInput): Promise<Buffer> {
  configure();
  const today = input.printedAt.slice(0, 10);
  const restock = restockRows(input.rows, today);
  const header: TableCell[] = ['Drug', 'Strength', 'Par', 'Opened', 'Wasted', 'Restock', 'Lots used', 'Lot on tray', 'Expiry', 'New lot', 'New expiry', 'Done'].map(
    (text) => ({ text, bold: true }),
  );
  const expiryCell = (r: ReconciledDrug): TableCell => {
    const note = expiryNote(r.trayExpiry, today);
    return note ? { text: [r.trayExpiry ?? '', '\n', { text: note.toUpperCase(), bold: true, fontSize: 9 }] } : (r.trayExpiry ?? '');
  };
  const body: TableCell[][] = [
    header,
    ...restock.map((r): TableCell[] => [
      { text: `${r.label}${r.controlled ? ' (controlled)' : ''}`, bold: r.controlled },
      r.strength ?? 'not on tray',
      r.par === null ? '' : String(r.par),
      String(r.unitsOpened),
      String(r.unitsWasted),
      { text: String(r.restock), bold: true },
      r.lotNumbers ?? '',
      r.trayLot ?? '',
      expiryCell(r),
      '',
      '',
      '____',
    ]),
  ];
  const flagged = input.rows.filter((r) => r.flagged);
  const content: Content[] = [
    { text: 'Code-cart restock list', style: 'title' },
    { text: `${input.facility} · ${input.unitName} · ${input.trayName}`, margin: [0, 0, 0, 4] },
    { text: `Code ${input.codeId}, arrest ${when(input.arrestAt)}${input.location ? `, ${input.location}` : ''}`, fontSize: 9 },
    { text: `Reconciliation: ${input.status}`, fontSize: 9, margin: [0, 0, 0, 10] },
    restock.length
      ? { table: { headerRows: 1, widths: ['*', 'auto', 'auto', 'auto', 'auto', 'auto', 'auto', 'auto', 88, 55, 55, 'auto'], body }, layout: 'lightHorizontalLines', fontSize: 9 }
      : { text: 'Nothing was opened from this tray and no lot on it expires within 30 days: nothing to restock.' },
    { text: flagged.length ? 'Discrepancies to resolve' : 'No discrepancies', style: 'section' },
    ...flagged.map((r): Content => ({ text: `PROBLEM: ${r.label}: ${r.discrepancies.map((d) => `${DISCREPANCY_WORDS[d.kind]}. ${d.message}`).join(' ')}`, margin: [0, 2, 0, 2] })),
    { text: '\nRestocked by: ______________________   Checked by: ______________________   Date/time: ______________', margin: [0, 16, 0, 0] },
  ];
  const definition: TDocumentDefinitions = {
    pageSize: 'A4',
    pageOrientation: 'landscape',
    pageMargins: [32, 32, 32, 40],
    defaultStyle: { font: 'Atkinson', fontSize: 10 },
    styles: { title: { fontSize: 18, bold: true, margin: [0, 0, 0, 4] }, section: { fontSize: 13, bold: true, margin: [0, 14, 0, 4] } },
    info: { title: `Restock list ${input.unitName}`, creator: 'Steadyhand' },
    footer: (page, pages) => ({ text: `Printed ${when(input.printedAt)} · page ${page} of ${pages}`, alignment: 'center', fontSize: 8 }),
    content,
  };
  return pdfmake.createPdf(definition).getBuffer();
}
