import { HttpClient, provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter, Router } from '@angular/router';
import { storeSession } from '../../testing/fixtures';
import { Auth, SESSION_STORAGE_KEY } from './auth';
import { authInterceptor } from './auth-interceptor';

describe('Auth', () => {
  let http: HttpTestingController;

  function setUp() {
    TestBed.configureTestingModule({
      providers: [
        provideRouter([]),
        provideHttpClient(withInterceptors([authInterceptor])),
        provideHttpClientTesting(),
      ],
    });
    http = TestBed.inject(HttpTestingController);
    return TestBed.inject(Auth);
  }

  beforeEach(() => localStorage.clear());
  afterEach(() => http.verify());

  it('stores the token and user after signing in and clears both on sign-out', () => {
    const auth = setUp();
    let signedInAs = '';
    auth.signIn(' tech', 'ember-tech').subscribe((user) => (signedInAs = user.username));
    const req = http.expectOne('/api/auth/login');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({ username: ' tech', password: 'ember-tech' });
    req.flush({
      token: 'jwt-abc',
      user: { id: 2, username: 'tech', displayName: 'Tess Tech', role: 'technician' },
    });

    expect(signedInAs).toBe('tech');
    expect(auth.token()).toBe('jwt-abc');
    expect(auth.canOperate()).toBe(true);
    expect(auth.isAdmin()).toBe(false);
    expect(JSON.parse(localStorage.getItem(SESSION_STORAGE_KEY)!).token).toBe('jwt-abc');

    auth.signOut();
    expect(auth.token()).toBeNull();
    expect(auth.user()).toBeNull();
    expect(localStorage.getItem(SESSION_STORAGE_KEY)).toBeNull();
  });

  it('restores a stored session on start', () => {
    storeSession('viewer');
    const auth = setUp();
    expect(auth.token()).toBe('test-token-viewer');
    expect(auth.canOperate()).toBe(false);
  });

  it('drops a stored token that has expired', () => {
    const payload = btoa(JSON.stringify({ sub: 1, exp: Math.floor(Date.now() / 1000) - 60 }));
    localStorage.setItem(
      SESSION_STORAGE_KEY,
      JSON.stringify({
        token: `x.${payload}.y`,
        user: { id: 1, username: 'tech', displayName: 'T', role: 'technician' },
      }),
    );
    const auth = setUp();
    expect(auth.signedIn()).toBe(false);
    expect(localStorage.getItem(SESSION_STORAGE_KEY)).toBeNull();
  });
});

describe('authInterceptor', () => {
  let http: HttpTestingController;
  let client: HttpClient;

  beforeEach(() => {
    localStorage.clear();
    TestBed.configureTestingModule({
      providers: [
        provideRouter([]),
        provideHttpClient(withInterceptors([authInterceptor])),
        provideHttpClientTesting(),
      ],
    });
    http = TestBed.inject(HttpTestingController);
    client = TestBed.inject(HttpClient);
  });
  afterEach(() => http.verify());

  it('adds the bearer header to API requests once signed in', () => {
    client.get('/api/benches').subscribe();
    const anonymous = http.expectOne('/api/benches');
    expect(anonymous.request.headers.has('Authorization')).toBe(false);
    anonymous.flush([]);

    storeSession('technician');
    TestBed.resetTestingModule();
    TestBed.configureTestingModule({
      providers: [
        provideRouter([]),
        provideHttpClient(withInterceptors([authInterceptor])),
        provideHttpClientTesting(),
      ],
    });
    http = TestBed.inject(HttpTestingController);
    TestBed.inject(HttpClient).get('/api/benches').subscribe();
    const req = http.expectOne('/api/benches');
    expect(req.request.headers.get('Authorization')).toBe('Bearer test-token-technician');
    req.flush([]);
  });

  it('keeps the token off requests outside the API', () => {
    storeSession('technician');
    TestBed.inject(Auth);
    client.get('icons/bolt.svg', { responseType: 'text' }).subscribe();
    const req = http.expectOne('icons/bolt.svg');
    expect(req.request.headers.has('Authorization')).toBe(false);
    req.flush('<svg></svg>');
  });

  it('signs out and goes to sign-in when the hub answers 401', async () => {
    storeSession('technician');
    const auth = TestBed.inject(Auth);
    const router = TestBed.inject(Router);
    const navigate = vi.spyOn(router, 'navigate').mockResolvedValue(true);
    client.get('/api/sweeps').subscribe({ error: () => undefined });
    http
      .expectOne('/api/sweeps')
      .flush(
        { error: { code: 'unauthorized', message: 'token expired' } },
        { status: 401, statusText: 'Unauthorized' },
      );

    expect(auth.signedIn()).toBe(false);
    expect(navigate).toHaveBeenCalledWith(['/sign-in'], expect.anything());
  });
});
