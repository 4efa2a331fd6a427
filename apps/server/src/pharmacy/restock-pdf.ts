import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { DISCREPANCY_WORDS, expiryNote, restockRows, type CartRestock, type CartRestockLine, type ReconciledDrug } from '@steadyhand/shared';
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

export interface CartRestockPdfInput {
  facility: string;
  restock: CartRestock;
  printedAt: string;
}

/** The cart's restock list over several codes: the same table, the codes it sums and those left out. */
export async function renderCartRestockPdf({ facility, restock, printedAt }: CartRestockPdfInput): Promise<Buffer> {
  configure();
  const header: TableCell[] = ['Drug', 'Strength', 'Par', 'Opened', 'Wasted', 'Restock', 'Lots used', 'Lot on tray', 'Expiry', 'Codes', 'New lot', 'New expiry', 'Done'].map(
    (text) => ({ text, bold: true }),
  );
  const codeNumber = new Map(restock.included.map((c, i) => [c.codeId, i + 1]));
  const expiryCell = (l: CartRestockLine): TableCell =>
    l.expiryNote ? { text: [l.trayExpiry ?? '', '\n', { text: l.expiryNote.toUpperCase(), bold: true, fontSize: 9 }] } : (l.trayExpiry ?? '');
  const body: TableCell[][] = [
    header,
    ...restock.lines.map((l): TableCell[] => [
      { text: `${l.label}${l.controlled ? ' (controlled)' : ''}`, bold: l.controlled },
      l.strength ?? 'not on tray',
      l.par === null ? '' : String(l.par),
      String(l.unitsOpened),
      String(l.unitsWasted),
      { text: String(l.restock), bold: true },
      l.lotsUsed.join(', '),
      l.trayLot ?? '',
      expiryCell(l),
      // Numbers of the codes listed above the table, to keep the column narrow.
      l.codeIds.map((id) => `#${codeNumber.get(id) ?? '?'}`).join(' '),
      '',
      '',
      '____',
    ]),
  ];
  const codeLine = (c: { codeId: string; arrestAt: string; location: string | null }) => `arrest ${when(c.arrestAt)}${c.location ? `, ${c.location}` : ''} (code ${c.codeId})`;
  const content: Content[] = [
    { text: 'Code-cart restock list, by cart', style: 'title' },
    { text: `${facility} · ${restock.unit.name} · ${restock.tray.name}`, margin: [0, 0, 0, 4] },
    { text: `Codes with an arrest from ${restock.since.slice(0, 10)} 00:00 UTC to ${when(restock.until)}`, fontSize: 9, margin: [0, 0, 0, 6] },
    { text: `Codes included (reconciliation signed off): ${restock.included.length}`, style: 'section' },
    ...(restock.included.length
      ? restock.included.map((c, i): Content => ({ text: `#${i + 1}  ${codeLine(c)}`, fontSize: 9 }))
      : [{ text: 'None: no code on this cart in the period has a signed-off reconciliation.', fontSize: 9 } as Content]),
    { text: `Codes left out: ${restock.leftOut.length}`, style: 'section' },
    ...(restock.leftOut.length
      ? restock.leftOut.map((c): Content => ({ text: `LEFT OUT: ${codeLine(c)}. ${c.message}`, fontSize: 9 }))
      : [{ text: 'None.', fontSize: 9 } as Content]),
    { text: 'To restock', style: 'section' },
    restock.lines.length
      ? { table: { headerRows: 1, widths: ['*', 'auto', 'auto', 'auto', 'auto', 'auto', 'auto', 'auto', 88, 'auto', 50, 50, 'auto'], body }, layout: 'lightHorizontalLines', fontSize: 9 }
      : { text: 'Nothing was opened from this cart in the codes included and no lot on its tray expires within 30 days: nothing to restock.' },
    { text: '\nRestocked by: ______________________   Checked by: ______________________   Date/time: ______________', margin: [0, 16, 0, 0] },
  ];
  const definition: TDocumentDefinitions = {
    pageSize: 'A4',
    pageOrientation: 'landscape',
    pageMargins: [32, 32, 32, 40],
    defaultStyle: { font: 'Atkinson', fontSize: 10 },
    styles: { title: { fontSize: 18, bold: true, margin: [0, 0, 0, 4] }, section: { fontSize: 13, bold: true, margin: [0, 12, 0, 4] } },
    info: { title: `Restock list ${restock.unit.name}`, creator: 'Steadyhand' },
    footer: (page, pages) => ({ text: `${restock.unit.name} · printed ${when(printedAt)} · Page ${page} of ${pages}`, alignment: 'center', fontSize: 8 }),
    content,
  };
  return pdfmake.createPdf(definition).getBuffer();
}
