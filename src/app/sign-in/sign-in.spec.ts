import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { importProvidersFrom } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatIconTestingModule } from '@angular/material/icon/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { provideRouter, Router } from '@angular/router';
import { Auth } from '../core/auth';
import { SignIn } from './sign-in';

describe('SignIn', () => {
  let http: HttpTestingController;

  async function render() {
    TestBed.configureTestingModule({
      imports: [SignIn],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        importProvidersFrom(MatIconTestingModule),
      ],
    });
    http = TestBed.inject(HttpTestingController);
    const fixture = TestBed.createComponent(SignIn);
    const loader = TestbedHarnessEnvironment.loader(fixture);
    await fixture.whenStable();
    const user = await loader.getHarness(
      MatInputHarness.with({ selector: '[formControlName=username]' }),
    );
    const password = await loader.getHarness(MatInputHarness.with({ selector: '[type=password]' }));
    const submit = await loader.getHarness(MatButtonHarness.with({ text: 'Sign in' }));
    return { fixture, user, password, submit };
  }

  beforeEach(() => localStorage.clear());
  afterEach(() => http.verify());

  it('shows a clear error when the hub answers 401', async () => {
    const { fixture, user, password, submit } = await render();
    await user.setValue('tech');
    await password.setValue('wrong');
    // The click waits for the app to settle, which waits for the pending request: flush first.
    const clicked = submit.click();
    const req = await vi.waitFor(() => http.expectOne('/api/auth/login'));
    req.flush(
      { error: { code: 'bad_credentials', message: 'wrong user name or password' } },
      { status: 401, statusText: 'Unauthorized' },
    );
    await clicked;
    await fixture.whenStable();

    const alert = (fixture.nativeElement as HTMLElement).querySelector('[role=alert]');
    expect(alert?.textContent).toContain('That user name and password do not match');
    expect(TestBed.inject(Auth).signedIn()).toBe(false);
    expect(await password.getValue()).toBe('');
  });

  it('signs in and goes to the bench page', async () => {
    const { user, password, submit } = await render();
    const navigate = vi.spyOn(TestBed.inject(Router), 'navigateByUrl').mockResolvedValue(true);
    await user.setValue('tech');
    await password.setValue('ember-tech');
    const clicked = submit.click();
    const req = await vi.waitFor(() => http.expectOne('/api/auth/login'));
    req.flush({
      token: 'jwt',
      user: { id: 2, username: 'tech', displayName: 'Tess', role: 'technician' },
    });
    await clicked;

    expect(TestBed.inject(Auth).token()).toBe('jwt');
    expect(navigate).toHaveBeenCalledWith('/bench');
  });

  it('sends nothing while a field is empty', async () => {
    const { user, submit } = await render();
    await user.setValue('tech');
    await submit.click();
    http.expectNone('/api/auth/login');
  });
});
