import { Icon } from '../../components/ui/icon';

/** What a signature means, said before the password is asked for. */
export function SigningStatement({ signer, meaning, number }: { signer: string; meaning: string; number: string }) {
  return (
    <p className="flex items-start gap-2.5 rounded-control border border-accent bg-accent-tint px-3 py-2.5 text-ink">
      <Icon name="key" size={20} className="mt-0.5 shrink-0 text-accent" />
      <span>
        You are signing as <span className="font-semibold">{signer}</span>: {meaning} on{' '}
        <span className="font-mono font-semibold">{number}</span>.
      </span>
    </p>
  );
}

export const PASSWORD_HINT =
  'Your sign-in password. It shows the signature is yours; nothing is saved if it does not match.';

/** Each form reports a step refused because the NCR moved on to the panel, which says it above every form. */
export type RunStep = (step: () => Promise<unknown>) => Promise<void>;
