import { DOCUMENT } from '@angular/common';
import { effect, inject, Injectable, InjectionToken, signal, untracked } from '@angular/core';
import { defer, filter, map, Observable, repeat, retry, share, timer } from 'rxjs';
import { webSocket, type WebSocketSubject } from 'rxjs/webSocket';
import type { BenchView, BrowserToHub, HubToBrowser } from '../../../shared/hub/messages';
import { Auth } from './auth';

/** WebSocket constructor the live connection uses (swapped in specs). */
export const WEB_SOCKET_CTOR = new InjectionToken<typeof WebSocket>('WEB_SOCKET_CTOR', {
  providedIn: 'root',
  factory: () => WebSocket,
});

/** Base delay between reconnection attempts, ms (grows per failed attempt up to 10 s). */
export const LIVE_RECONNECT_MS = new InjectionToken<number>('LIVE_RECONNECT_MS', {
  providedIn: 'root',
  factory: () => 1000,
});

/** How long the socket may be down before the user is told, ms. */
export const LINK_DOWN_GRACE_MS = 3000;

/** Hub messages about one sweep. */
export type SweepMessage = Extract<HubToBrowser, { type: 'sweep' } | { type: 'points' }>;

type Frame = HubToBrowser | BrowserToHub;

/**
 * The browser's one socket to the hub (/ws/live). It is open while a user is signed in,
 * reconnects after errors and after clean closes, and re-sends every watch after reconnecting,
 * so watchers see no gap beyond the hub's replay of stored points.
 */
@Injectable({ providedIn: 'root' })
export class LiveConnection {
  private readonly auth = inject(Auth);
  private readonly document = inject(DOCUMENT);
  private readonly socketCtor = inject(WEB_SOCKET_CTOR);
  private readonly reconnectMs = inject(LIVE_RECONNECT_MS);

  private socket: WebSocketSubject<Frame> | null = null;
  /** Sweep id -> number of subscribers watching it. */
  private readonly watchers = new Map<number, number>();
  private readonly connectedState = signal(false);
  private readonly benchesState = signal<BenchView[] | null>(null);
  private readonly lastErrorState = signal<{ code: string; message: string } | null>(null);

  private readonly linkDownState = signal(false);
  private linkDownTimer: ReturnType<typeof setTimeout> | null = null;

  /** Whether the socket is open. */
  readonly connected = this.connectedState.asReadonly();
  /**
   * Whether the socket has been down for a while (LINK_DOWN_GRACE_MS): worth telling the user,
   * unlike the moment of connecting after a page load.
   */
  readonly linkDown = this.linkDownState.asReadonly();
  /** Benches as the hub last reported them, or null before the first report. */
  readonly benches = this.benchesState.asReadonly();
  /** The last error message the hub sent on the socket. */
  readonly lastError = this.lastErrorState.asReadonly();

  /** Every hub message, from one shared socket. */
  readonly messages$: Observable<HubToBrowser> = defer(() => this.openSocket()).pipe(
    map((frame) => frame as HubToBrowser),
    retry({
      delay: (_err, attempt) => timer(Math.min(this.reconnectMs * attempt, 10_000)),
      resetOnSuccess: true,
    }),
    // A clean close (hub restart) completes the stream rather than erroring it.
    repeat({ delay: () => timer(this.reconnectMs) }),
    share(),
  );

  constructor() {
    effect((onCleanup) => {
      if (!this.auth.token()) {
        this.benchesState.set(null);
        return;
      }
      const sub = untracked(() => this.messages$.subscribe((m) => this.handle(m)));
      onCleanup(() => {
        sub.unsubscribe();
        this.clearLinkDownTimer();
        this.linkDownState.set(false);
      });
    });
  }

  /**
   * Messages about one sweep: its state, then the points stored so far, then live points.
   * Unsubscribing stops the watch once no other subscriber wants it.
   */
  watchSweep(sweepId: number): Observable<SweepMessage> {
    return new Observable<SweepMessage>((subscriber) => {
      const sub = this.messages$
        .pipe(
          filter(
            (m): m is SweepMessage =>
              (m.type === 'sweep' && m.sweep.id === sweepId) ||
              (m.type === 'points' && m.sweepId === sweepId),
          ),
        )
        .subscribe(subscriber);
      const count = this.watchers.get(sweepId) ?? 0;
      this.watchers.set(sweepId, count + 1);
      // While disconnected the watch is sent on (re)connect instead.
      if (count === 0) this.send({ type: 'watch-sweep', sweepId });
      return () => {
        const left = (this.watchers.get(sweepId) ?? 1) - 1;
        if (left > 0) {
          this.watchers.set(sweepId, left);
        } else {
          this.watchers.delete(sweepId);
          this.send({ type: 'unwatch-sweep', sweepId });
        }
        sub.unsubscribe();
      };
    });
  }

  /** Asks the hub to abort a sweep; false if the socket is not open (use REST then). */
  abortSweep(sweepId: number): boolean {
    return this.send({ type: 'abort-sweep', sweepId });
  }

  /** Asks the hub to abort a quick test; false if the socket is not open (use REST then). */
  abortQuickTest(quickTestId: number): boolean {
    return this.send({ type: 'abort-quick-test', quickTestId });
  }

  private send(message: BrowserToHub): boolean {
    if (!this.socket || !this.connectedState()) return false;
    this.socket.next(message);
    return true;
  }

  private openSocket(): WebSocketSubject<Frame> {
    const token = this.auth.token() ?? '';
    const url = new URL('/ws/live', this.document.location.href);
    url.protocol = url.protocol === 'https:' ? 'wss:' : 'ws:';
    url.searchParams.set('token', token);
    const socket: WebSocketSubject<Frame> = webSocket<Frame>({
      url: url.toString(),
      WebSocketCtor: this.socketCtor,
      openObserver: {
        next: () => {
          this.connectedState.set(true);
          this.clearLinkDownTimer();
          this.linkDownState.set(false);
          // Queued by the subject and flushed right after this callback.
          for (const sweepId of this.watchers.keys()) socket.next({ type: 'watch-sweep', sweepId });
        },
      },
      closeObserver: {
        next: () => {
          if (this.socket !== socket) return;
          this.connectedState.set(false);
          this.startLinkDownTimer();
        },
      },
    });
    this.socket = socket;
    if (!this.connectedState()) this.startLinkDownTimer();
    return socket;
  }

  private startLinkDownTimer(): void {
    if (this.linkDownTimer) return;
    this.linkDownTimer = setTimeout(() => {
      this.linkDownTimer = null;
      if (!this.connectedState()) this.linkDownState.set(true);
    }, LINK_DOWN_GRACE_MS);
  }

  private clearLinkDownTimer(): void {
    if (this.linkDownTimer) clearTimeout(this.linkDownTimer);
    this.linkDownTimer = null;
  }

  private handle(message: HubToBrowser): void {
    if (message.type === 'benches') this.benchesState.set(message.benches);
    else if (message.type === 'error') this.lastErrorState.set(message);
  }
}
