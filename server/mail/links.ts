/** The address people open Coretrail at, for links in e-mail. Set once by createApp. */
let base = 'http://127.0.0.1:4310';

export function setAppUrl(url: string) {
  base = url.replace(/\/+$/, '');
}

export const appLink = (path: string) => `${base}${path.startsWith('/') ? path : `/${path}`}`;
