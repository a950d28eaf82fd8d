import { useEffect } from 'react';
import { useSearchParams } from 'react-router-dom';

const STORAGE_KEY = 'tareline.benchId';
export const DEFAULT_BENCH_ID = 'bench-1';

function stored(): string | null {
  try {
    return localStorage.getItem(STORAGE_KEY);
  } catch {
    return null;
  }
}

/**
 * Which bench this screen is: `?bench=bench-2` in the address sets it and is remembered, so the
 * screen keeps its bench after a restart; otherwise the remembered one, or bench-1.
 */
export function useBenchId(): string {
  const [params] = useSearchParams();
  const fromUrl = params.get('bench')?.trim() || null;
  useEffect(() => {
    if (!fromUrl) return;
    try {
      localStorage.setItem(STORAGE_KEY, fromUrl);
    } catch {
      // No storage: the address keeps working on its own.
    }
  }, [fromUrl]);
  return fromUrl ?? stored() ?? DEFAULT_BENCH_ID;
}
