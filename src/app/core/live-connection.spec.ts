import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import type { BrowserToHub, HubToBrowser } from '../../../shared/hub/messages';
import { benchView, storeSession, sweepView } from '../../testing/fixtures';
import { Auth } from './auth';
import {
  LINK_DOWN_GRACE_MS,
  LIVE_RECONNECT_MS,
  LiveConnection,
  WEB_SOCKET_CTOR,
  type SweepMessage,
} from './live-connection';

/** An in-memory WebSocket: the test plays the hub's side. */
class FakeSocket {
  static all: FakeSocket[] = [];
  readyState = 0;
  readonly sent: BrowserToHub[] = [];
  onopen: ((e: Event) => void) | null = null;
  onclose: ((e: CloseEvent) => void) | null = null;
  onerror: ((e: Event) => void) | null = null;
  onmessage: ((e: MessageEvent) => void) | null = null;

  constructor(readonly url: string) {
    FakeSocket.all.push(this);
  }

  send(data: string): void {
    this.sent.push(JSON.parse(data) as BrowserToHub);
  }

  close(): void {
    this.finish(true);
  }

  /** The hub accepts the connection. */
  accept(): void {
    this.readyState = 1;
    this.onopen?.(new Event('open'));
  }

  /** The hub sends a message. */
  deliver(message: HubToBrowser): void {
    this.onmessage?.(new MessageEvent('message', { data: JSON.stringify(message) }));
  }

  /** The connection ends: cleanly (hub restart) or not (network). */
  finish(clean: boolean): void {
    if (this.readyState === 3) return;
    this.readyState = 3;
    this.onclose?.({ wasClean: clean, code: clean ? 1000 : 1006 } as CloseEvent);
  }
}

describe('LiveConnection', () => {
  let live: LiveConnection;

  const latest = () => FakeSocket.all.at(-1)!;
  const nextSocket = (after: number) =>
    vi.waitFor(() => {
      expect(FakeSocket.all.length).toBeGreaterThan(after);
      return latest();
    });

  beforeEach(() => {
    FakeSocket.all = [];
    localStorage.clear();
    storeSession('technician');
    TestBed.configureTestingModule({
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: WEB_SOCKET_CTOR, useValue: FakeSocket },
        { provide: LIVE_RECONNECT_MS, useValue: 5 },
      ],
    });
    live = TestBed.inject(LiveConnection);
    TestBed.tick();
  });

  afterEach(() => {
    TestBed.inject(Auth).signOut();
    TestBed.tick();
    localStorage.clear();
  });

  it('connects with the token in the URL while signed in and keeps the benches it reports', async () => {
    const socket = await nextSocket(0);
    expect(socket.url).toMatch(/^ws:\/\/[^/]+\/ws\/live\?token=test-token-technician$/);
    socket.accept();
    expect(live.connected()).toBe(true);
    socket.deliver({ type: 'benches', benches: [benchView()] });
    expect(live.benches()?.map((b) => b.name)).toEqual(['Bench A']);
  });

  it('watches a sweep and passes on only that sweep’s messages', async () => {
    const socket = await nextSocket(0);
    socket.accept();
    const seen: SweepMessage[] = [];
    const sub = live.watchSweep(7).subscribe((m) => seen.push(m));
    expect(socket.sent).toEqual([{ type: 'watch-sweep', sweepId: 7 }]);

    socket.deliver({ type: 'sweep', sweep: sweepView({ id: 8 }) });
    socket.deliver({ type: 'points', sweepId: 8, points: [] });
    socket.deliver({ type: 'sweep', sweep: sweepView({ id: 7 }) });
    expect(seen.map((m) => m.type)).toEqual(['sweep']);

    sub.unsubscribe();
    expect(socket.sent.at(-1)).toEqual({ type: 'unwatch-sweep', sweepId: 7 });
  });

  it('reconnects after a dropped connection and sends the watch again', async () => {
    const first = await nextSocket(0);
    first.accept();
    const sub = live.watchSweep(7).subscribe();
    first.finish(false);
    expect(live.connected()).toBe(false);

    const second = await nextSocket(1);
    second.accept();
    expect(second.sent).toEqual([{ type: 'watch-sweep', sweepId: 7 }]);
    sub.unsubscribe();
  });

  it('reconnects after a clean close as well', async () => {
    const first = await nextSocket(0);
    first.accept();
    const sub = live.watchSweep(3).subscribe();
    first.finish(true);

    const second = await nextSocket(1);
    second.accept();
    expect(second.sent).toEqual([{ type: 'watch-sweep', sweepId: 3 }]);
    sub.unsubscribe();
  });

  it('shares one socket between watchers and sends one watch per sweep', async () => {
    const socket = await nextSocket(0);
    socket.accept();
    const a = live.watchSweep(7).subscribe();
    const b = live.watchSweep(7).subscribe();
    expect(FakeSocket.all).toHaveLength(1);
    expect(socket.sent).toEqual([{ type: 'watch-sweep', sweepId: 7 }]);
    a.unsubscribe();
    expect(socket.sent).toHaveLength(1);
    b.unsubscribe();
    expect(socket.sent.at(-1)).toEqual({ type: 'unwatch-sweep', sweepId: 7 });
  });

  it('closes the socket on sign-out', async () => {
    const socket = await nextSocket(0);
    socket.accept();
    TestBed.inject(Auth).signOut();
    TestBed.tick();
    expect(socket.readyState).toBe(3);
    expect(live.benches()).toBeNull();
  });

  it('sends an abort only while connected', async () => {
    const socket = await nextSocket(0);
    expect(live.abortSweep(7)).toBe(false);
    socket.accept();
    expect(live.abortSweep(7)).toBe(true);
    expect(socket.sent).toEqual([{ type: 'abort-sweep', sweepId: 7 }]);
  });

  it('reports the link as down only after it has stayed down for the grace period', async () => {
    const socket = await nextSocket(0);
    socket.accept();
    vi.useFakeTimers();
    try {
      socket.finish(false);
      expect(live.linkDown()).toBe(false);
      vi.advanceTimersByTime(LINK_DOWN_GRACE_MS - 1);
      expect(live.linkDown()).toBe(false);
      vi.advanceTimersByTime(1);
      expect(live.linkDown()).toBe(true);
      // The reconnection attempt ran on the fake clock; the hub takes it.
      latest().accept();
      expect(live.linkDown()).toBe(false);
    } finally {
      vi.useRealTimers();
    }
  });
});
