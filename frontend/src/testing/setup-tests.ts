import '@testing-library/jest-dom/vitest';
import { cleanup, configure } from '@testing-library/react';
import { afterEach, vi } from 'vitest';
import { authToken } from '@/lib/auth-token';

// Pages load lazily, and the first import of a page compiles it: give "find" queries room.
configure({ asyncUtilTimeout: 8000 });

// jsdom lacks a few browser APIs antd relies on for layout; these stand-ins only answer "no
// media query matches" and "no size change", which is what a headless document would report.
if (!window.matchMedia) {
  Object.defineProperty(window, 'matchMedia', {
    writable: true,
    value: (query: string) => ({
      matches: false,
      media: query,
      onchange: null,
      addListener: () => undefined,
      removeListener: () => undefined,
      addEventListener: () => undefined,
      removeEventListener: () => undefined,
      dispatchEvent: () => false,
    }),
  });
}

if (!('ResizeObserver' in window)) {
  class NoResizeObserver {
    observe(): void {}
    unobserve(): void {}
    disconnect(): void {}
  }
  Object.defineProperty(window, 'ResizeObserver', { writable: true, value: NoResizeObserver });
  Object.defineProperty(globalThis, 'ResizeObserver', { writable: true, value: NoResizeObserver });
}

// jsdom cannot compute pseudo-element styles and logs an error each time antd measures one.
const computeStyle = window.getComputedStyle.bind(window);
window.getComputedStyle = ((element: Element) => computeStyle(element)) as typeof window.getComputedStyle;

afterEach(() => {
  cleanup();
  window.localStorage.clear();
  authToken.reloadFromStorage();
  vi.unstubAllGlobals();
});
