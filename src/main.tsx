import { inTabletMode } from './lib/tablet-mode';
import '@fontsource/ibm-plex-sans/400.css';
import '@fontsource/ibm-plex-sans/500.css';
import '@fontsource/ibm-plex-sans/600.css';
import '@fontsource/ibm-plex-mono/400.css';
import '@fontsource/ibm-plex-mono/500.css';
import '@fontsource/ibm-plex-mono/600.css';
import './index.css';
import { onlineManager, QueryClientProvider } from '@tanstack/react-query';
import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { RouterProvider } from 'react-router';
import { rememberedLanguage, setLanguage } from './lib/i18n';
import { keepCache, restoreCache } from './lib/persist-cache';
import { makeQueryClient } from './lib/query-client';
import { signInHref } from './lib/paths';
import { createRouter } from './router';

// TanStack Query takes itself to be online until an 'offline' event: a page loaded (from the
// service worker) with no network would ask the server first and show an error, not the cache
onlineManager.setOnline(navigator.onLine);

// a session can end under an open page (expiry, password changed elsewhere, deactivation)
const queryClient = makeQueryClient({
  onSignedOut: () => {
    // a shared tablet has no person's session to lose: its page says when it is not enrolled
    if (inTabletMode()) return;
    // called only once requests run, by when `router` below exists
    const going = router.state.navigation.location ?? router.state.location;
    void router.navigate(signInHref({ next: `${going.pathname}${going.search}`, note: 'expired' }), { replace: true });
  },
});
let router: ReturnType<typeof createRouter>;

// what a station kept from before a reload is in the cache before the first loader asks for it
// the sign-in page speaks the language of whoever last signed in here
void Promise.all([restoreCache(queryClient), setLanguage(rememberedLanguage())]).then(() => {
  keepCache(queryClient);
  router = createRouter(queryClient);
  createRoot(document.getElementById('root')!).render(
    <StrictMode>
      <QueryClientProvider client={queryClient}>
        <RouterProvider router={router} />
      </QueryClientProvider>
    </StrictMode>,
  );
  // the app shell for a reload with no network (vite.config.ts); a development server has none
  if (import.meta.env.PROD && 'serviceWorker' in navigator) {
    void navigator.serviceWorker.register('/sw.js', { scope: '/' }).catch(() => undefined);
  }
});
