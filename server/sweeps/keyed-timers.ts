/** One-shot timers by key; setting a key again replaces its timer. */
export class KeyedTimers {
  private readonly timers = new Map<string, NodeJS.Timeout>();

  /** Runs `fn` after `ms` unless cleared first. */
  set(key: string, ms: number, fn: () => void): void {
    this.clear(key);
    const t = setTimeout(() => {
      this.timers.delete(key);
      fn();
    }, ms);
    t.unref();
    this.timers.set(key, t);
  }

  /** Cancels the timer of `key`, if any. */
  clear(key: string): void {
    const t = this.timers.get(key);
    if (t) clearTimeout(t);
    this.timers.delete(key);
  }

  /** Whether a timer for `key` is pending. */
  has(key: string): boolean {
    return this.timers.has(key);
  }

  /** Cancels every timer. */
  clearAll(): void {
    for (const t of this.timers.values()) clearTimeout(t);
    this.timers.clear();
  }
}
