import { useQuery } from '@tanstack/react-query';
import { useWatch } from 'react-hook-form';
import { LOT_KIND_LABELS, LOT_KINDS, SIZED_LOT_KINDS, type LotKind } from '../../../shared/schemas/build';
import type { EngineFamily } from '../../../shared/schemas/reference';
import { useItem } from '../../api/items/item';
import { itemResultsQueryOptions } from '../../api/items/results';
import { useSuppliers } from '../../api/reference/suppliers';
import { NumberField, SelectField, TextField } from '../../components/form-fields';
import { Icon } from '../../components/ui/icon';
import { t, useT } from '../../lib/i18n';
import { label } from '../../lib/server-messages';
import { boreFit, OVERSIZE_WARN_IN, oversizeWords } from './piston-fit';
import { lotKeys, messagesFor, RefusalLines, useRefusals } from './refusals';
import { useChosenFamily } from './use-family';

/** The label a screen reader and a test read ("Pistons lot code"); on screen the row names the part once. */
function RowLabel({ kind, what }: { kind: LotKind; what: string }) {
  return (
    <>
      <span className="sr-only">
        {t('lot.rowLabel', { kind: label(LOT_KIND_LABELS[kind]), what: what.toLowerCase() })}
      </span>
      <span aria-hidden="true">{what}</span>
    </>
  );
}

/** What the block's bore says about the pistons, before the server is asked. */
function useBoreFit(family: EngineFamily | undefined) {
  const block = useWatch({ name: 'block' }) as string | undefined;
  const item = useItem(block || null);
  const isBlock = item.data?.kind === 'block' && item.data.serial === block;
  const results = useQuery({ ...itemResultsQueryOptions(block ?? ''), enabled: isBlock });
  if (!isBlock || !family || !results.data) return null;
  return boreFit(block!, results.data, family.boreMm);
}

function PistonFit({ family }: { family: EngineFamily | undefined }) {
  const fit = useBoreFit(family);
  const entered = useWatch({ name: `lots.${LOT_KINDS.indexOf('pistons')}.oversizeIn` }) as unknown;
  if (!fit) return null;
  const value = typeof entered === 'number' && Number.isFinite(entered) ? entered : null;
  const off = value !== null && Math.abs(fit.oversizeIn - value) > OVERSIZE_WARN_IN;
  return (
    <div className="flex flex-col gap-1 text-sm md:col-span-full">
      <p className="text-ink-soft">
        <span className="font-mono text-ink">{fit.serial}</span> was honed to{' '}
        <span className="font-mono text-ink">{oversizeWords(fit.oversizeIn)}</span> (mean bore{' '}
        <span className="font-mono">{fit.meanIn.toFixed(4)} in</span> against{' '}
        <span className="font-mono">{fit.standardIn.toFixed(4)} in</span> standard).
      </p>
      {off && (
        <p role="status" className="flex items-start gap-1.5 font-medium text-bad">
          <Icon name="bad" size={18} className="mt-0.5 shrink-0" />
          These pistons are {oversizeWords(value)}, but the block was honed to {oversizeWords(fit.oversizeIn)}: they do
          not match its bore.
        </p>
      )}
    </div>
  );
}

function LotRow({ index, family }: { index: number; family: EngineFamily | undefined }) {
  const kind = LOT_KINDS[index]!;
  useT();
  const suppliers = useSuppliers();
  const { refusal, clear } = useRefusals();
  const refused = messagesFor(refusal, lotKeys(index));
  const options = (suppliers.data ?? []).map((s) => ({ value: String(s.id), label: s.name }));
  const pistons = kind === 'pistons';
  const base = `lots.${index}`;
  return (
    <li
      id={`lot-${kind}`}
      // any change in the row makes the last refusal of it out of date
      onChange={() => {
        if (refused.length) clear(lotKeys(index));
      }}
      className={`grid grid-cols-1 gap-x-3 gap-y-2 border-b border-rule py-4 last:border-b-0 xl:grid-cols-[9rem_minmax(0,1fr)] ${refused.length ? 'border-l-4 border-l-bad pl-3' : ''}`}
    >
      <h3 className="pt-1 text-lg font-semibold xl:pt-8">{label(LOT_KIND_LABELS[kind])}</h3>
      <div className="grid grid-cols-2 items-start gap-3 md:grid-cols-[minmax(0,1.5fr)_minmax(0,1fr)_minmax(0,1fr)_6rem_8.5rem]">
        <div className="col-span-2 md:col-span-1">
          <SelectField
            name={`${base}.supplierId`}
            label={<RowLabel kind={kind} what={t('build.supplier')} />}
            options={options}
            placeholder={t('common.choose')}
            numeric
          />
        </div>
        <TextField name={`${base}.partNumber`} label={<RowLabel kind={kind} what={t('lot.partNumber')} />} mono />
        <TextField name={`${base}.lotCode`} label={<RowLabel kind={kind} what={t('lot.lotCode')} />} mono />
        <NumberField name={`${base}.quantity`} label={<RowLabel kind={kind} what={t('lot.quantity')} />} integer />
        {pistons ? (
          <NumberField
            name={`${base}.oversizeIn`}
            label={<RowLabel kind={kind} what={t('lot.oversize')} />}
            hint={t('lot.oversizeHint')}
          />
        ) : (
          <span aria-hidden="true" className="hidden md:block" />
        )}
        {SIZED_LOT_KINDS.includes(kind) && (
          <TextField
            name={`${base}.sizeClass`}
            label={<RowLabel kind={kind} what={t('lot.sizeClass')} />}
            hint={t(pistons ? 'lot.sizeHintPistons' : 'lot.sizeHint')}
            mono
          />
        )}
        {pistons && <PistonFit family={family} />}
        {refused.length > 0 && (
          <div className="col-span-full">
            <RefusalLines messages={refused} />
          </div>
        )}
      </div>
    </li>
  );
}

/** The nine purchased lots every long block takes, one row each, in the order they go in. */
export function LotRows() {
  const family = useChosenFamily();
  return (
    <ol className="flex flex-col">
      {LOT_KINDS.map((k, i) => (
        <LotRow key={k} index={i} family={family} />
      ))}
    </ol>
  );
}
