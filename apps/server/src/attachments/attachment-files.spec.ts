import { describe, expect, it } from 'vitest';
import { AttachmentRefused, cleanFilename, contentDisposition, detectAttachmentType } from './attachment-files.js';

describe('attachment file checks', () => {
  it('keeps only the last path part of a name, without control characters', () => {
    expect(cleanFilename('C:\\Users\\nurse\\strip 07:43.png')).toBe('strip 07:43.png');
    expect(cleanFilename('../../etc/passwd')).toBe('passwd');
    expect(cleanFilename('strip\r\nX-Evil: 1.png')).toBe('stripX-Evil: 1.png');
    expect(cleanFilename(`${'a'.repeat(300)}.jpeg`)).toHaveLength(180);
    expect(cleanFilename(`${'a'.repeat(300)}.jpeg`).endsWith('.jpeg')).toBe(true);
  });

  it('strips bidirectional controls, so the name shown is the name stored', () => {
    expect(cleanFilename('strip\u202egnp.pdf')).toBe('stripgnp.pdf');
    expect(cleanFilename('\u2067scan\u2069\u200f.png\u200e')).toBe('scan.png');
    expect(cleanFilename('\u061cnote\u202a\u202b\u202c\u202d.jpg\u2066\u2068\u2028\u2029')).toBe('note.jpg');
    expect(cleanFilename('مراقبة 1.png')).toBe('مراقبة 1.png');
  });

  it('builds a Content-Disposition that no name can break', () => {
    expect(contentDisposition('attachment', 'défib "1".pdf')).toBe(`attachment; filename="d_fib _1_.pdf"; filename*=UTF-8''d%C3%A9fib%20%221%22.pdf`);
    expect(contentDisposition('inline', "it's (1).png")).toBe(`inline; filename="it's (1).png"; filename*=UTF-8''it%27s%20%281%29.png`);
  });

  it('accepts a JPEG by its bytes under any of its usual extensions, or none', async () => {
    const jpeg = Buffer.from([0xff, 0xd8, 0xff, 0xe0, 0x00, 0x10, 0x4a, 0x46, 0x49, 0x46, 0x00, 0x01, 0x01, 0x00, 0x00, 0x01, 0x00, 0x01, 0x00, 0x00]);
    for (const name of ['photo.jpg', 'photo.JPEG', 'photo']) {
      await expect(detectAttachmentType(jpeg, name)).resolves.toEqual({ mediaType: 'image/jpeg', extension: 'jpg' });
    }
    await expect(detectAttachmentType(jpeg, 'photo.webp')).rejects.toBeInstanceOf(AttachmentRefused);
  });

  it('calls binary that is no known format by that name', async () => {
    await expect(detectAttachmentType(Buffer.from([0x00, 0x01, 0xfe, 0x02, 0x00, 0x99]), 'x.png')).rejects.toThrow(/no known file format/);
  });
});
