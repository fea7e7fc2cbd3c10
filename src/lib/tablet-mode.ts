/**
 * A shared station tablet (`/tablet`): no person is signed in, so the station form comes from the
 * tablet's own routes and each result carries the badge and PIN of whoever took it. The station
 * screen's pieces ask here which door to use. The identity lasts one result, and is dropped at once
 * when the server refuses the badge and PIN, so the screen asks for them again.
 */
let on = false;
let identity: { badge: string; pin: string } | null = null;
const listeners = new Set<() => void>();

export const inTabletMode = () => on;
export const enterTabletMode = () => {
  on = true;
};
export const setTabletIdentity = (who: { badge: string; pin: string } | null) => {
  identity = who;
  listeners.forEach((l) => l());
};
export const tabletIdentity = () => identity;
export const subscribeTabletIdentity = (onChange: () => void) => {
  listeners.add(onChange);
  return () => listeners.delete(onChange);
};
