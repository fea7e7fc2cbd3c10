import { Wordmark } from '../../components/wordmark';

/** Shown for the moment between the first paint and knowing who is signed in. */
export function LoadingScreen() {
  return (
    <main className="flex min-h-screen flex-col items-center justify-start gap-2 px-4 py-[14vh]" aria-busy="true">
      <Wordmark large />
      <p className="text-ink-soft" role="status">
        Loading…
      </p>
    </main>
  );
}
