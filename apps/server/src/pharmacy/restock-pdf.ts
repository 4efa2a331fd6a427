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

/** The columns both lists share, in print order; the cart list adds `Codes` after `Expiry`. */
const headerCells = (names: string[]): TableCell[] => names.map((text) => ({ text, bold: true }));

/** The tray's expiry, with its warning in capitals when the lot has expired or expires soon. */
const expiryCell = (expiry: string | null, note: string | null): TableCell =>
  note ? { text: [expiry ?? '', '\n', { text: note.toUpperCase(), bold: true, fontSize: 9 }] } : (expiry ?? '');

/** Drug (controlled in bold) to lot on tray: the same cells on both lists. */
function countCells(l: {
  label: string;
  controlled: boolean;
  strength: string | null;
  par: number | null;
  unitsOpened: number;
  unitsWasted: number;
  restock: number;
  lots: string;
  trayLot: string | null;
}): TableCell[] {
  return [
    { text: `${l.label}${l.controlled ? ' (controlled)' : ''}`, bold: l.controlled },
    l.strength ?? 'not on tray',
    l.par === null ? '' : String(l.par),
    String(l.unitsOpened),
    String(l.unitsWasted),
    { text: String(l.restock), bold: true },
    l.lots,
    l.trayLot ?? '',
  ];
}

/** Blank columns for the person restocking: new lot, new expiry, a box to tick. */
const FILL_IN: TableCell[] = ['', '', '____'];
const SIGN_LINE: Content = { text: '\nRestocked by: ______________________   Checked by: ______________________   Date/time: ______________', margin: [0, 16, 0, 0] };

/** Landscape A4 in Atkinson, a title and section style, the footer line on every page. */
function listDocument(infoTitle: string, content: Content[], footer: (page: number, pages: number) => string, sectionTop: number): TDocumentDefinitions {
  return {
    pageSize: 'A4',
    pageOrientation: 'landscape',
    pageMargins: [32, 32, 32, 40],
    defaultStyle: { font: 'Atkinson', fontSize: 10 },
    styles: { title: { fontSize: 18, bold: true, margin: [0, 0, 0, 4] }, section: { fontSize: 13, bold: true, margin: [0, sectionTop, 0, 4] } },
    info: { title: infoTitle, creator: 'Steadyhand' },
    footer: (page, pages) => ({ text: footer(page, pages), alignment: 'center', fontSize: 8 }),
    content,
  };
}

export async function renderRestockPdf(input: RestockPdfInput): Promise<Buffer> {
  configure();
  const today = input.printedAt.slice(0, 10);
  const restock = restockRows(input.rows, today);
  const body: TableCell[][] = [
    headerCells(['Drug', 'Strength', 'Par', 'Opened', 'Wasted', 'Restock', 'Lots used', 'Lot on tray', 'Expiry', 'New lot', 'New expiry', 'Done']),
    ...restock.map((r): TableCell[] => [...countCells({ ...r, lots: r.lotNumbers ?? '' }), expiryCell(r.trayExpiry, expiryNote(r.trayExpiry, today)), ...FILL_IN]),
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
    SIGN_LINE,
  ];
  const definition = listDocument(`Restock list ${input.unitName}`, content, (page, pages) => `Printed ${when(input.printedAt)} · page ${page} of ${pages}`, 14);
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
  const codeNumber = new Map(restock.included.map((c, i) => [c.codeId, i + 1]));
  const body: TableCell[][] = [
    headerCells(['Drug', 'Strength', 'Par', 'Opened', 'Wasted', 'Restock', 'Lots used', 'Lot on tray', 'Expiry', 'Codes', 'New lot', 'New expiry', 'Done']),
    ...restock.lines.map((l: CartRestockLine): TableCell[] => [
      ...countCells({ ...l, lots: l.lotsUsed.join(', ') }),
      expiryCell(l.trayExpiry, l.expiryNote),
      // Numbers of the codes listed above the table, to keep the column narrow.
      l.codeIds.map((id) => `#${codeNumber.get(id) ?? '?'}`).join(' '),
      ...FILL_IN,
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
    SIGN_LINE,
  ];
  const definition = listDocument(`Restock list ${restock.unit.name}`, content, (page, pages) => `${restock.unit.name} · printed ${when(printedAt)} · Page ${page} of ${pages}`, 12);
  return pdfmake.createPdf(definition).getBuffer();
}
