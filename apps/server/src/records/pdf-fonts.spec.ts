import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { woffToSfnt } from './pdf-fonts.js';

const require = createRequire(import.meta.url);
const woff = readFileSync(
  require.resolve('@fontsource/atkinson-hyperlegible/files/atkinson-hyperlegible-latin-400-normal.woff'),
);

/** OpenType table checksum: the sum of the table's big-endian 32-bit words, padded with zeros. */
function checksum(data: Buffer): number {
  const padded = Buffer.concat([data, Buffer.alloc((4 - (data.length % 4)) % 4)]);
  let sum = 0;
  for (let i = 0; i < padded.length; i += 4) sum = (sum + padded.readUInt32BE(i)) >>> 0;
  return sum;
}

describe('woffToSfnt', () => {
  it('unpacks every table of the WOFF font so each matches the checksum the WOFF recorded for it', () => {
    const sfnt = woffToSfnt(woff);
    const numTables = sfnt.readUInt16BE(4);
    expect(sfnt.readUInt32BE(0)).toBe(woff.readUInt32BE(4)); // the flavour: TrueType outlines
    expect(numTables).toBe(woff.readUInt16BE(12));
    // The sfnt size the WOFF header announces (W3C WOFF 1.0, totalSfntSize).
    expect(sfnt.length).toBe(woff.readUInt32BE(16));
    const tags: string[] = [];
    for (let i = 0; i < numTables; i++) {
      const at = 12 + i * 16;
      const tag = sfnt.toString('latin1', at, at + 4);
      tags.push(tag);
      const offset = sfnt.readUInt32BE(at + 8);
      const data = Buffer.from(sfnt.subarray(offset, offset + sfnt.readUInt32BE(at + 12)));
      // The head table's checksum is taken with its checkSumAdjustment (bytes 8..11) as zero.
      if (tag === 'head') data.writeUInt32BE(0, 8);
      expect(checksum(data), tag).toBe(sfnt.readUInt32BE(at + 4));
      expect(offset % 4).toBe(0);
    }
    expect(tags).toEqual(expect.arrayContaining(['glyf', 'head', 'name', 'cmap']));
  });

  it('refuses what is not a WOFF 1.0 font', () => {
    expect(() => woffToSfnt(Buffer.from('wOF2\0\0\0\0'.padEnd(48, '\0')))).toThrow(
      'not a WOFF 1.0 font',
    );
  });
});
