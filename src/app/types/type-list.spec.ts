import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { importProvidersFrom } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatDialog } from '@angular/material/dialog';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import { MatIconTestingModule } from '@angular/material/icon/testing';
import { provideRouter, Router } from '@angular/router';
import { storeSession, VALVE_TYPE_VIEWS } from '../../testing/fixtures';
import { TypeList } from './type-list';

describe('TypeList', () => {
  let fixture: ComponentFixture<TypeList>;
  let http: HttpTestingController;
  const element = () => fixture.nativeElement as HTMLElement;
  const newType = () =>
    [...element().querySelectorAll('button')].find((b) => b.textContent!.includes('New type'));

  async function render(role: 'admin' | 'technician') {
    storeSession(role);
    TestBed.configureTestingModule({
      imports: [TypeList],
      providers: [
        provideRouter([{ path: 'types/:designation', children: [] }]),
        provideHttpClient(),
        provideHttpClientTesting(),
        importProvidersFrom(MatIconTestingModule),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(TypeList);
    fixture.detectChanges();
    await fixture.whenStable();
    http.expectOne('/api/valve-types').flush(VALVE_TYPE_VIEWS);
    http.match('/api/settings').forEach((r) =>
      r.flush({
        labelPrefix: 'WK-',
        labelDigits: 4,
        nextLabelNumber: 1,
        gradeThresholds: { strongMinPercent: 80, fairMinPercent: 65 },
      }),
    );
    await fixture.whenStable();
  }

  afterEach(() => {
    http.verify();
    localStorage.clear();
  });

  it('offers technicians no new-type action', async () => {
    await render('technician');
    expect(element().textContent).toContain('12AX7');
    expect(newType()).toBeUndefined();
  });

  it("opens an admin's new type on its own page once added", async () => {
    await render('admin');
    newType()!.click();
    await fixture.whenStable();
    const dialog =
      await TestbedHarnessEnvironment.documentRootLoader(fixture).getHarness(MatDialogHarness);
    expect(await dialog.getTitleText()).toBe('New valve type');
    // The dialog closes with the type the hub created (its own spec covers the form).
    TestBed.inject(MatDialog).openDialogs[0].close({ designation: '6BX4' });
    await vi.waitFor(() => expect(TestBed.inject(Router).url).toBe('/types/6BX4'));
  });
});
