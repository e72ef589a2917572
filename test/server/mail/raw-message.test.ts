import MailComposer from 'nodemailer/lib/mail-composer';
import { describe, expect, it } from 'vitest';
import { parseRawMessage } from '../../../server/mail/raw-message';

function compose(options: ConstructorParameters<typeof MailComposer>[0]): Promise<string> {
  return new Promise((resolve, reject) =>
    new MailComposer(options)
      .compile()
      .build((error, message) => (error ? reject(error) : resolve(message.toString('utf8')))),
  );
}

describe('parseRawMessage', () => {
  it('reads headers and attachments of a message nodemailer built', async () => {
    const pdf = Buffer.concat([Buffer.from('%PDF-1.3\n'), Buffer.alloc(3000, 0xa7)]);
    const raw = await compose({
      from: 'hub@workshop.test',
      to: 'buyer@example.test',
      subject: 'Match report MS-0042 — quad',
      text: 'Attached.',
      attachments: [
        { filename: 'match-report-MS-0042.pdf', content: pdf, contentType: 'application/pdf' },
        { filename: 'notes.txt', content: 'plain words', contentType: 'text/plain' },
      ],
    });
    const m = parseRawMessage(raw);
    expect(m.subject).toBe('Match report MS-0042 — quad');
    expect(m.to).toBe('buyer@example.test');
    expect(m.messageId).toMatch(/^<.+@.+>$/);
    expect(m.attachments.map((a) => a.filename)).toEqual(['match-report-MS-0042.pdf', 'notes.txt']);
    expect(m.attachments[0].contentType).toBe('application/pdf');
    expect(m.attachments[0].content.equals(pdf)).toBe(true);
    expect(m.attachments[1].content.toString('utf8')).toBe('plain words');
  });

  it('finds no attachment in a plain message, and reads its text', async () => {
    const m = parseRawMessage(await compose({ to: 'a@b.test', subject: 'hi', text: 'hello' }));
    expect(m.subject).toBe('hi');
    expect(m.text).toBe('hello');
    expect(m.attachments).toEqual([]);
  });

  it('decodes a long quoted-printable text with non-ASCII units beside an attachment', async () => {
    const text =
      'Ia spread 1.2 %, gm 11 000 µS ± 2 %, within the usual 5 % tolerance. '.repeat(4) +
      '\nSecond line = ok.';
    const raw = await compose({
      to: 'a@b.test',
      subject: 'figures',
      text,
      attachments: [
        { filename: 'a.pdf', content: Buffer.from('%PDF-'), contentType: 'application/pdf' },
      ],
    });
    expect(raw).toMatch(/quoted-printable/i);
    const m = parseRawMessage(raw);
    expect(m.text).toBe(text);
    expect(m.attachments.map((a) => a.filename)).toEqual(['a.pdf']);
  });
});
