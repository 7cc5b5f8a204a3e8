/**
 * The signed-in session: the bearer token in localStorage, plus why the last
 * session ended so the sign-in page can say so. Kept outside React so the API
 * client can end a session on a 401 from any request.
 */
const TOKEN_KEY = 'kiln.token';
const END_REASON_KEY = 'kiln.sessionEndReason';

export type SessionEndReason = 'signed-out' | 'expired';

type Listener = () => void;
const listeners = new Set<Listener>();

function readStorage(storage: Storage, key: string): string | null {
  try {
    return storage.getItem(key);
  } catch {
    // Storage can be unavailable (privacy modes); treat as signed out.
    return null;
  }
}

function notify(): void {
  for (const listener of listeners) listener();
}

export function getToken(): string | null {
  return readStorage(localStorage, TOKEN_KEY);
}

export function startSession(token: string): void {
  localStorage.setItem(TOKEN_KEY, token);
  sessionStorage.removeItem(END_REASON_KEY);
  notify();
}

/** Drops the token. Idempotent: a burst of 401s ends the session once. */
export function endSession(reason: SessionEndReason): void {
  if (getToken() === null) return;
  localStorage.removeItem(TOKEN_KEY);
  sessionStorage.setItem(END_REASON_KEY, reason);
  notify();
}

/** Why the previous session ended, if the sign-in page has not shown it yet. */
export function peekSessionEndReason(): SessionEndReason | null {
  const value = readStorage(sessionStorage, END_REASON_KEY);
  return value === 'signed-out' || value === 'expired' ? value : null;
}

export function clearSessionEndReason(): void {
  sessionStorage.removeItem(END_REASON_KEY);
}

/** For useSyncExternalStore; also follows sign-in/out in other tabs. */
export function subscribeToSession(listener: Listener): () => void {
  listeners.add(listener);
  const onStorage = (event: StorageEvent) => {
    if (event.key === TOKEN_KEY || event.key === null) listener();
  };
  window.addEventListener('storage', onStorage);
  return () => {
    listeners.delete(listener);
    window.removeEventListener('storage', onStorage);
  };
}
