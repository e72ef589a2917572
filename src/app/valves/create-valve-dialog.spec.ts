import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { importProvidersFrom } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MAT_DIALOG_DATA, MatDialogRef } from '@angular/material/dialog';
import { MatIconTestingModule } from '@angular/material/icon/testing';
import { CreateValveDialog } from './create-valve-dialog';
import { valveView } from './valve-view-fixture';

describe('CreateValveDialog', () => {
  let fixture: ComponentFixture<CreateValveDialog>;
  let http: HttpTestingController;
  const close = vi.fn();
  const element = () => fixture.nativeElement as HTMLElement;
  const addButton = () =>
    [...element().querySelectorAll('button')].find((b) => b.textContent!.includes('Add record'))!;
  const type = (name: string, value: string) => {
    const input = element().querySelector(`[formcontrolname=${name}]`) as HTMLInputElement;
    input.value = value;
    input.dispatchEvent(new Event('input'));
  };

  beforeEach(async () => {
    close.mockReset();
    TestBed.configureTestingModule({
      imports: [CreateValveDialog],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        importProvidersFrom(MatIconTestingModule),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
        { provide: MAT_DIALOG_DATA, useValue: { types: [{ designation: '12AX7' }] } },
        { provide: MatDialogRef, useValue: { close } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(CreateValveDialog);
    await fixture.whenStable();
  });

  afterEach(() => http.verify());

  it('needs a type before it adds a record', async () => {
    type('maker', 'Aldermoor');
    await fixture.whenStable();
    expect(addButton().disabled).toBe(true);
  });

  it('posts the printed maker and date code, leaves the label to the hub, and closes', async () => {
    (
      fixture.componentInstance as unknown as { form: { patchValue(v: object): void } }
    ).form.patchValue({
      type: '12AX7',
    });
    type('maker', ' Aldermoor ');
    type('dateCode', 'B3K');
    await fixture.whenStable();
    addButton().click();
    const req = http.expectOne('/api/valves');
    expect(req.request.body).toEqual({
      type: '12AX7',
      maker: 'Aldermoor',
      dateCode: 'B3K',
      originKind: null,
      originText: null,
      location: null,
      status: 'in-stock',
      notes: null,
    });
    req.flush(valveView({ id: 31 }), { status: 201, statusText: 'Created' });
    expect(close).toHaveBeenCalledWith(expect.objectContaining({ id: 31 }));
  });

  it('shows the hub message when the record is refused', async () => {
    (
      fixture.componentInstance as unknown as { form: { patchValue(v: object): void } }
    ).form.patchValue({
      type: '12AX7',
      label: 'WK-0001',
    });
    await fixture.whenStable();
    addButton().click();
    http
      .expectOne('/api/valves')
      .flush(
        { error: { code: 'conflict', message: 'label WK-0001 is taken' } },
        { status: 409, statusText: 'Conflict' },
      );
    await fixture.whenStable();
    expect(element().querySelector('.error')!.textContent).toContain('label WK-0001 is taken');
    expect(close).not.toHaveBeenCalled();
  });
});
