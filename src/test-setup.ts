// jsdom lacks what uPlot and the layout observers touch; stub just enough to construct them.
// (The `canvas` npm package would download a native binary; a no-op 2-D context suffices.)

if (!window.matchMedia) {
  window.matchMedia = (query: string): MediaQueryList =>
    ({
      matches: false,
      media: query,
      onchange: null,
      addListener: () => undefined,
      removeListener: () => undefined,
      addEventListener: () => undefined,
      removeEventListener: () => undefined,
      dispatchEvent: () => false,
    }) as MediaQueryList;
}

HTMLCanvasElement.prototype.getContext = function getContext(this: HTMLCanvasElement) {
  return new Proxy(
    { canvas: this, measureText: (text: string) => ({ width: text.length * 6 }) },
    { get: (target, key) => (key in target ? target[key as keyof typeof target] : () => undefined), set: () => true },
  );
} as unknown as HTMLCanvasElement['getContext'];

if (!('ResizeObserver' in window)) {
  (window as unknown as { ResizeObserver: unknown }).ResizeObserver = class {
    observe(): void {}
    unobserve(): void {}
    disconnect(): void {}
  };
}

// uPlot builds its lines as Path2D objects once a chart holds data; a stub that accepts every call.
if (!('Path2D' in window)) {
  (window as unknown as { Path2D: unknown }).Path2D = class {
    constructor() {
      return new Proxy(this, { get: (target, key) => (key in target ? target[key as keyof typeof target] : () => undefined) });
    }
  };
}
