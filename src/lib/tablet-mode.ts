/**
 * A shared station tablet (`/tablet`): no person is signed in, so the station form comes from the
 * tablet's own routes and each result carries the badge and PIN of whoever took it. The station
 * screen's pieces ask here which door to use. The identity lasts one result, then is forgotten.
 */
let on = false;
let identity: { badge: string; pin: string } | null = null;

export const inTabletMode = () => on;
export const enterTabletMode = () => {
  on = true;
};
export const setTabletIdentity = (who: { badge: string; pin: string } | null) => {
  identity = who;
};
export const tabletIdentity = () => identity;
