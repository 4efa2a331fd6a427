import MailComposer from 'nodemailer/lib/mail-composer';
import { describe, expect, it } from 'vitest';
import { decodeEncodedWords, readMessage } from './eml-reader.js';

const compose = (options: ConstructorParameters<typeof MailComposer>[0]) =>
  new MailComposer(options).compile().build();

describe('readMessage (the fake relay reading what nodemailer sent)', () => {
  it('decodes an encoded subject and a quoted-printable body with long lines and non-ASCII text', async () => {
    const text = `Location: Cardiac Step-Down 3B – bed 4\nRead the record: https://steadyhand.harbourview.example/codes/${'x'.repeat(120)}/record\nSigned by: Zoë Ångström`;
    const raw = await compose({ from: 'a@harbourview.example', to: 'b@harbourview.example', subject: 'Code record signed: Cardiac Step-Down 3B – bed 4', text });
    expect(raw.toString('latin1')).toMatch(/quoted-printable|base64/i);
    const read = readMessage(raw);
    expect(read.subject).toBe('Code record signed: Cardiac Step-Down 3B – bed 4');
    expect(read.text).toBe(text);
  });

  it('finds the text/plain part of a multipart message', async () => {
    const raw = await compose({ from: 'a@harbourview.example', to: 'b@harbourview.example', subject: 'plain', text: 'the text part', html: '<p>the html part</p>' });
    expect(readMessage(raw).text).toBe('the text part');
  });

  it('joins adjacent encoded words without the space between them', () => {
    expect(decodeEncodedWords('=?UTF-8?Q?Zo=C3=AB?= =?UTF-8?B?w4VuZ3N0csO2bQ==?= signed')).toBe('ZoëÅngström signed');
  });
});
