import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { importProvidersFrom } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatIconTestingModule } from '@angular/material/icon/testing';
import { byteSize, OutboxPage } from './outbox-page';
import type { DevMailMessage } from './reports-api';

function message(id: number, over: Partial<DevMailMessage> = {}): DevMailMessage {
  return {
    id,
    receivedAt: `2026-11-0${id}T10:15:00.000Z`,
    envelopeFrom: 'emberline@localhost',
    envelopeTo: ['buyer@example.test'],
    subject: `Match report MS-000${id} (EL34)`,
    from: 'Emberline <emberline@localhost>',
    to: 'buyer@example.test',
    messageId: `<m${id}@localhost>`,
    textPreview: 'Your quad.\n\n4 x EL34: EL34-001, EL34-003',
    attachments: [
      {
        index: 0,
        filename: `match-report-MS-000${id}.pdf`,
        contentType: 'application/pdf',
        bytes: 48_213,
      },
    ],
    ...over,
  };
}

describe('OutboxPage', () => {
  let fixture: ComponentFixture<OutboxPage>;
  let http: HttpTestingController;
  let el: HTMLElement;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [OutboxPage],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        importProvidersFrom(MatIconTestingModule),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(OutboxPage);
    el = fixture.nativeElement as HTMLElement;
    await fixture.whenStable();
  });

  afterEach(() => http.verify());

  const list = async (messages: DevMailMessage[]) => {
    http
      .expectOne((r) => r.url === '/api/dev-mail' && r.params.get('limit') === '100')
      .flush(messages);
    await fixture.whenStable();
  };

  it('lists the messages in the order the hub gives them, newest first', async () => {
    await list([message(2), message(1, { attachments: [], textPreview: null })]);
    const items = [...el.querySelectorAll('li.message')];
    expect(items.map((i) => i.querySelector('h2')!.textContent!.trim())).toEqual([
      'Match report MS-0002 (EL34)',
      'Match report MS-0001 (EL34)',
    ]);
    const addresses = [...items[0].querySelectorAll('.addresses div')].map((d) =>
      [...d.children].map((c) => c.textContent!.trim()).join(' '),
    );
    expect(addresses).toEqual(['From Emberline <emberline@localhost>', 'To buyer@example.test']);
    const first = items[0].textContent!.replace(/\s+/g, ' ');
    expect(items[0].querySelector('time')!.getAttribute('datetime')).toBe(
      '2026-11-02T10:15:00.000Z',
    );
    expect(first).toContain('2 Nov 2026');
    expect(items[0].querySelector('.preview')!.textContent).toContain('4 x EL34');
    expect(first).toContain('match-report-MS-0002.pdf');
    expect(first).toContain('application/pdf · 48 kB');
    expect(items[1].querySelector('.preview, .attachments')).toBeNull();
  });

  it('explains that this is the development catcher and what production does instead', async () => {
    await list([]);
    expect(el.querySelector('.explain')!.textContent).toMatch(/development mail catcher/);
    expect(el.querySelector('.explain')!.textContent).toContain('SMTP_URL');
    expect(el.querySelector('.empty h2')!.textContent).toBe('No messages yet');
  });

  it('downloads an attachment as a blob by its place in the message', async () => {
    await list([message(3)]);
    const click = vi.spyOn(HTMLAnchorElement.prototype, 'click').mockImplementation(() => {});
    const create = vi.spyOn(URL, 'createObjectURL').mockReturnValue('blob:attachment');
    (el.querySelector('.attachments button') as HTMLButtonElement).click();
    const req = http.expectOne('/api/dev-mail/3/attachments/0');
    expect(req.request.responseType).toBe('blob');
    req.flush(new Blob(['%PDF-'], { type: 'application/pdf' }));
    expect(create).toHaveBeenCalled();
    expect(click).toHaveBeenCalled();
    click.mockRestore();
    create.mockRestore();
  });

  it('shows why the list could not be read', async () => {
    http
      .expectOne((r) => r.url === '/api/dev-mail')
      .flush(
        { error: { code: 'forbidden', message: 'needs the admin role' } },
        { status: 403, statusText: 'Forbidden' },
      );
    await fixture.whenStable();
    expect(el.querySelector('[role="alert"]')!.textContent).toContain('needs the admin role');
  });
});

describe('byteSize', () => {
  it('reads bytes as B, kB and MB', () => {
    expect(byteSize(512)).toBe('512 B');
    expect(byteSize(1_500)).toBe('1.5 kB');
    expect(byteSize(48_213)).toBe('48 kB');
    expect(byteSize(2_400_000)).toBe('2.4 MB');
  });
});
