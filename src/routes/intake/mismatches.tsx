import { useWatch } from 'react-hook-form';
import { intakeMismatches } from '../../../shared/schemas/intake';
import { TextAreaField } from '../../components/form-fields';
import { Notice } from '../../components/ui/notice';
import { useT } from '../../lib/i18n';
import { localizeText } from '../../lib/server-messages';

/**
 * The dock's own record checked against itself as it is filled in (damage against grade and credit,
 * parts missing against credit), plus what the server found (a casting number seen on another
 * family). Any of them asks for a reason to go on; none stops a receipt outright.
 */
export function MismatchCheck({ fromServer }: { fromServer: string[] }) {
  const t = useT();
  const [damage, missing, grade, creditDecision, accepted] = useWatch({
    name: ['damage', 'missing', 'grade', 'creditDecision', 'accepted'],
  }) as [string[] | undefined, string[] | undefined, string | undefined, string | undefined, boolean | undefined];
  const own = intakeMismatches({ damage, missing, grade, creditDecision, accepted });
  const all = [...own, ...fromServer.filter((m) => !own.includes(m))];
  if (!all.length) return null;
  return (
    <div className="flex flex-col gap-3">
      <Notice tone="hold" title={t('mismatch.title')}>
        <ul className="mt-1 list-disc pl-5">
          {all.map((m) => (
            <li key={m}>{localizeText(m)}</li>
          ))}
        </ul>
      </Notice>
      <TextAreaField name="mismatchReason" label={t('mismatch.reason')} optional hint={t('mismatch.hint')} />
    </div>
  );
}
