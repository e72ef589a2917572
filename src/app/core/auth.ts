import { HttpClient } from '@angular/common/http';
import { computed, inject, Injectable, signal } from '@angular/core';
import { Observable, map, tap } from 'rxjs';

/** What a signed-in user may do. */
export type Role = 'admin' | 'technician' | 'viewer';

/** The signed-in user, as the hub reports it. */
export interface SessionUser {
  id: number;
  username: string;
  displayName: string;
  role: Role;
}

/** Answer of POST /api/auth/login. */
export interface LoginResponse {
  token: string;
  user: SessionUser;
}

interface Session {
  token: string;
  user: SessionUser;
}

/** localStorage key of the session (token and user). */
export const SESSION_STORAGE_KEY = 'emberline.session';

/** Holds the sign-in token and user; the token survives a reload in localStorage. */
@Injectable({ providedIn: 'root' })
export class Auth {
  private readonly http = inject(HttpClient);
  private readonly session = signal<Session | null>(readStoredSession());

  /** The bearer token, or null when signed out. */
  readonly token = computed(() => this.session()?.token ?? null);
  /** The signed-in user, or null. */
  readonly user = computed(() => this.session()?.user ?? null);
  readonly signedIn = computed(() => this.session() !== null);
  /** Technicians and admins run and abort sweeps; viewers only watch. */
  readonly canOperate = computed(() => {
    const role = this.user()?.role;
    return role === 'admin' || role === 'technician';
  });
  readonly isAdmin = computed(() => this.user()?.role === 'admin');

  /** Signs in and stores the session; errors (401 and others) pass through to the caller. */
  signIn(username: string, password: string): Observable<SessionUser> {
    return this.http.post<LoginResponse>('/api/auth/login', { username, password }).pipe(
      tap((res) => this.store({ token: res.token, user: res.user })),
      map((res) => res.user),
    );
  }

  /** Re-reads the user from the hub (role changes take effect without signing in again). */
  refreshUser(): Observable<SessionUser> {
    return this.http.get<SessionUser | { user: SessionUser }>('/api/auth/me').pipe(
      map((res) => ('user' in res ? res.user : res)),
      tap((user) => {
        const token = this.token();
        if (token) this.store({ token, user });
      }),
    );
  }

  /** Forgets the token and user. */
  signOut(): void {
    localStorage.removeItem(SESSION_STORAGE_KEY);
    this.session.set(null);
  }

  private store(session: Session): void {
    localStorage.setItem(SESSION_STORAGE_KEY, JSON.stringify(session));
    this.session.set(session);
  }
}

function readStoredSession(): Session | null {
  try {
    const raw = localStorage.getItem(SESSION_STORAGE_KEY);
    if (!raw) return null;
    const session = JSON.parse(raw) as Session;
    if (typeof session?.token !== 'string' || !session.user) return null;
    // An expired token would only earn a 401 and a bounce to sign-in; drop it up front.
    if (tokenExpired(session.token)) {
      localStorage.removeItem(SESSION_STORAGE_KEY);
      return null;
    }
    return session;
  } catch {
    return null;
  }
}

function tokenExpired(token: string): boolean {
  const payload = token.split('.')[1];
  if (!payload) return false;
  try {
    const json = JSON.parse(atob(payload.replace(/-/g, '+').replace(/_/g, '/'))) as {
      exp?: number;
    };
    return typeof json.exp === 'number' && json.exp * 1000 <= Date.now();
  } catch {
    return false;
  }
}
