import { signInResponseSchema, type Role, type SignInResponse } from '@tareline/protocol';
import { useSyncExternalStore } from 'react';

/** The signed-in session of this screen: the token and who it belongs to. */
export type Session = SignInResponse;

const STORAGE_KEY = 'tareline.session';
const listeners = new Set<() => void>();
let current: Session | null | undefined;

function read(): Session | null {
  try {
    const raw = localStorage.getItem(STORAGE_KEY);
    if (!raw) return null;
    const parsed = signInResponseSchema.safeParse(JSON.parse(raw));
    return parsed.success ? parsed.data : null;
  } catch {
    return null;
  }
}

function notify() {
  for (const listener of listeners) listener();
}

/** The current session, or null when nobody is signed in or the token has run out. */
export function getSession(): Session | null {
  if (current === undefined) current = read();
  if (current && current.expiresAt <= Date.now()) {
    setSession(null);
    return null;
  }
  return current;
}

/** Bearer token for the hub, if signed in. */
export function getToken(): string | undefined {
  return getSession()?.token;
}

/** Stores (or with null, forgets) the session and tells every `useSession()` user. */
export function setSession(session: Session | null): void {
  current = session;
  try {
    if (session) localStorage.setItem(STORAGE_KEY, JSON.stringify(session));
    else localStorage.removeItem(STORAGE_KEY);
  } catch {
    // Private mode without storage: the session lives in memory only.
  }
  notify();
}

function subscribe(listener: () => void): () => void {
  listeners.add(listener);
  const onStorage = (event: StorageEvent) => {
    if (event.key !== STORAGE_KEY) return;
    current = read();
    listener();
  };
  window.addEventListener('storage', onStorage);
  return () => {
    listeners.delete(listener);
    window.removeEventListener('storage', onStorage);
  };
}

/** Who is signed in on this screen; re-renders on sign-in and sign-out (in any tab). */
export function useSession(): Session | null {
  return useSyncExternalStore(subscribe, getSession, () => null);
}

/** True when the session's role is one of `roles`. */
export function hasRole(session: Session | null, roles: readonly Role[]): boolean {
  return !!session && roles.includes(session.user.role);
}
