import '@testing-library/jest-dom/vitest';
import { cleanup } from '@testing-library/react';
import { afterEach, vi } from 'vitest';
import { setSession } from '../lib/auth';

afterEach(() => {
  cleanup();
  setSession(null);
  localStorage.clear();
  vi.unstubAllGlobals();
});

vi.mock('uplot', () => import('./fake-uplot'));
vi.mock('uplot/dist/uPlot.min.css', () => ({}));
