import { useSyncExternalStore } from 'react';

// The homes tiles are cached by URL (the browser's HTTP cache and MapLibre's tile cache). When records that
// change a home's outcome reach the server, the version changes and the map asks for the tiles under a new
// URL. The version is the time of the last change, kept across reloads so a reload does not fall back to a
// tile URL cached before that change.
const KEY = 'tractwise.homeTilesVersion';

function stored(): number {
  try {
    return Number(localStorage.getItem(KEY)) || 0;
  } catch {
    return 0;
  }
}

let version = typeof localStorage === 'undefined' ? 0 : stored();
const listeners = new Set<() => void>();

/** Makes the map fetch the homes tiles again (after visits or tests were saved). */
export function bumpHomeTilesVersion() {
  version = Math.max(Date.now(), version + 1);
  try {
    localStorage.setItem(KEY, String(version));
  } catch {
    /* the in-memory version still refreshes this page */
  }
  for (const listener of listeners) listener();
}

function subscribe(listener: () => void) {
  listeners.add(listener);
  return () => listeners.delete(listener);
}

/** The current homes tiles version (0 until anything was saved on this device). */
export function useHomeTilesVersion(): number {
  return useSyncExternalStore(subscribe, () => version);
}
