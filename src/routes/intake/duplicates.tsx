import { useState } from 'react';
import { useFormContext } from 'react-hook-form';
import { duplicateQuery, type ReceiveCoreBody } from '../../../shared/schemas/intake';
import { useDuplicates, type DuplicateCheck } from '../../api/cores/duplicates';
import type { Duplicate } from '../../api/cores/types';
import { CheckboxField } from '../../components/choice-fields';
import { Notice } from '../../components/ui/notice';
import { formatDay, language, useT } from '../../lib/i18n';
import { coreHref } from '../../lib/paths';

function DuplicateList({ rows }: { rows: Duplicate[] }) {
  const t = useT();
  return (
    <ul className="mt-1 flex flex-col gap-1">
      {rows.map((d) => (
        <li key={d.serial} className="flex flex-wrap items-baseline gap-x-3">
          {/* a new tab, so the half-filled form stays as it is */}
          <a
            href={coreHref(d.serial)}
            target="_blank"
            rel="noopener"
            className="font-mono font-semibold text-accent underline underline-offset-4"
          >
            {d.serial}
          </a>
          <span className="text-ink-soft">
            {t('dup.received')}{' '}
            <span className={language() === 'en' ? 'font-mono' : undefined}>{formatDay(d.receivedOn)}</span>,{' '}
            {t('dup.casting')} <span className="font-mono">{d.castingNumber}</span>
            {d.idNumber && (
              <>
                , {t('dup.id')} <span className="font-mono">{d.idNumber}</span>
              </>
            )}
            {d.accepted ? '' : ` ${t('dup.rejected')}`}
          </span>
        </li>
      ))}
    </ul>
  );
}

/**
 * Asks the server for recent look-alikes when the number fields are left, not on every keystroke,
 * and only once the numbers are well formed. Returns the handler for the fields' wrapper.
 */
export function useDuplicateWarning() {
  const t = useT();
  const { getValues } = useFormContext<ReceiveCoreBody>();
  const [numbers, setNumbers] = useState<DuplicateCheck | null>(null);
  const found = useDuplicates(numbers);
  const onLeave = () => {
    const parsed = duplicateQuery.safeParse({
      castingNumber: getValues('castingNumber'),
      idNumber: getValues('idNumber') || undefined,
    });
    setNumbers(parsed.success ? parsed.data : null);
  };
  const rows = numbers ? (found.data ?? []) : [];
  const warning =
    rows.length > 0 ? (
      <Notice tone="hold" live="status" title={t('dup.title')}>
        <p>{t(numbers?.idNumber ? 'dup.sameId' : 'dup.sameCasting', { count: rows.length })}</p>
        <DuplicateList rows={rows} />
      </Notice>
    ) : null;
  return { onLeave, warning };
}

/** After a 409 possible_duplicate: the look-alikes, and the tick that says this one is different. */
export function DuplicateConfirm({ rows }: { rows: Duplicate[] }) {
  const t = useT();
  return (
    <div className="flex flex-col gap-3 rounded-control border-2 border-hold bg-hold-tint px-4 py-3">
      <p className="font-semibold text-hold">{t('dup.check')}</p>
      <DuplicateList rows={rows} />
      <CheckboxField name="confirmNotDuplicate" label={t('dup.different')} />
    </div>
  );
}
