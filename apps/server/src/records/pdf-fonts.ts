import { inflateSync } from 'node:zlib';

/**
 * A WOFF 1.0 font (what @fontsource ships) unpacked into the plain TrueType/OpenType file it
 * wraps (W3C WOFF 1.0, sections 3 to 5). pdfkit would otherwise inflate the font's tables again
 * for every document; unpacked once per process, each PDF reads them as they are.
 */
export function woffToSfnt(woff: Buffer): Buffer {
  if (woff.readUInt32BE(0) !== 0x774f4646) throw new Error('not a WOFF 1.0 font');
  const flavor = woff.readUInt32BE(4);
  const numTables = woff.readUInt16BE(12);
  const tables = Array.from({ length: numTables }, (_, i) => {
    const at = 44 + i * 20;
    const offset = woff.readUInt32BE(at + 4);
    const compLength = woff.readUInt32BE(at + 8);
    const origLength = woff.readUInt32BE(at + 12);
    const raw = woff.subarray(offset, offset + compLength);
    return {
      tag: woff.readUInt32BE(at),
      checksum: woff.readUInt32BE(at + 16),
      data: compLength < origLength ? inflateSync(raw) : raw,
    };
  });
  // The sfnt header's binary-search fields (OpenType, "Table directory").
  const power = 2 ** Math.floor(Math.log2(numTables));
  const header = Buffer.alloc(12 + numTables * 16);
  header.writeUInt32BE(flavor, 0);
  header.writeUInt16BE(numTables, 4);
  header.writeUInt16BE(power * 16, 6);
  header.writeUInt16BE(Math.log2(power), 8);
  header.writeUInt16BE(numTables * 16 - power * 16, 10);
  const parts: Buffer[] = [header];
  let offset = header.length;
  tables.forEach((t, i) => {
    const at = 12 + i * 16;
    header.writeUInt32BE(t.tag, at);
    header.writeUInt32BE(t.checksum, at + 4);
    header.writeUInt32BE(offset, at + 8);
    header.writeUInt32BE(t.data.length, at + 12);
    const padded = (t.data.length + 3) & ~3;
    parts.push(t.data, Buffer.alloc(padded - t.data.length));
    offset += padded;
  });
  return Buffer.concat(parts);
}
