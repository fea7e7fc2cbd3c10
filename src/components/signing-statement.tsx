import { Icon } from './ui/icon';

/** What a signature means, said before the password is asked for. */
export function SigningStatement({ signer, meaning, subject }: { signer: string; meaning: string; subject: string }) {
  return (
    <p className="flex items-start gap-2.5 rounded-control border border-accent bg-accent-tint px-3 py-2.5 text-ink">
      <Icon name="key" size={20} className="mt-0.5 shrink-0 text-accent" />
      <span>
        You are signing as <span className="font-semibold">{signer}</span>: {meaning} on{' '}
        <span className="font-mono font-semibold">{subject}</span>.
      </span>
    </p>
  );
}

export const PASSWORD_HINT =
  'Your sign-in password. It shows the signature is yours; nothing is saved if it does not match.';
