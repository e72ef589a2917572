// jsdom has no ResizeObserver; ngx-echarts refuses to start without one.
class ResizeObserverStub {
  observe(): void {}
  unobserve(): void {}
  disconnect(): void {}
}

// jsdom's window is what components see as document.defaultView: stub on it, not globalThis.
if (typeof window.ResizeObserver !== 'function') {
  Object.defineProperty(window, 'ResizeObserver', { value: ResizeObserverStub, writable: true });
}

// jsdom lacks matchMedia, which the theme service reads for the system colour scheme.
if (typeof window.matchMedia !== 'function') {
  Object.defineProperty(window, 'matchMedia', {
    writable: true,
    value: (query: string) => ({
      matches: false,
      media: query,
      onchange: null,
      addEventListener: () => {},
      removeEventListener: () => {},
      addListener: () => {},
      removeListener: () => {},
      dispatchEvent: () => false,
    }),
  });
}

// The first harness test of a file compiles Material's styles and templates on a cold worker;
// on a busy two-core machine that alone can pass Vitest's 5 s default.
vi.setConfig({ testTimeout: 30_000 });
