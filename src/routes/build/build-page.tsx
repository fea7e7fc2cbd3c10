import type { QueryClient } from '@tanstack/react-query';
import { Fragment, useState } from 'react';
import type { LoaderFunctionArgs } from 'react-router';
import type { BuildBody } from '../../../shared/schemas/build';
import { useSignedIn } from '../../api/auth/me';
import type { ItemJson } from '../../api/items/types';
import { familiesQueryOptions } from '../../api/reference/families';
import { suppliersQueryOptions } from '../../api/reference/suppliers';
import { PageHeader } from '../../components/page-header';
import { Button, ButtonLink } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Notice } from '../../components/ui/notice';
import { t, useT } from '../../lib/i18n';
import { partName } from '../../lib/item-status';
import { label } from '../../lib/server-messages';
import { itemHref, labelsHref, stationHref } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { BuildForm } from './build-form';
import { ReplacePart } from './replace-part';
import { buildWords } from './screen-words';
import { slotsFor } from './slots';

export const buildLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'assembly.record');
    await Promise.all([
      queryClient.ensureQueryData(familiesQueryOptions()),
      queryClient.ensureQueryData(suppliersQueryOptions()),
      buildWords(),
    ]);
    return null;
  };

type Built = { unit: ItemJson; body: BuildBody };

function BuildDone({ built, canPrint, onNext }: { built: Built; canPrint: boolean; onNext: () => void }) {
  useT();
  const { unit, body } = built;
  const first = unit.currentStage?.name ?? unit.route[0]?.name;
  const parts = slotsFor(unit.family).map((s) => ({
    label: label(s.label),
    serial:
      s.name === 'block'
        ? body.block
        : s.name === 'crankshaft'
          ? body.crankshaft
          : body.heads[Number(s.name.split('.')[1])],
  }));
  return (
    <Card labelledBy="built-heading">
      <CardHeader id="built-heading" title={t('build.doneTitle')} description={t('build.doneIntro')} />
      <CardBody>
        <div className="flex flex-col gap-5">
          <Notice tone="ok" live="status" title={t('build.started', { serial: unit.serial })}>
            {partName(label(unit.kindLabel), unit.positionLabel)}, {unit.family.code} {unit.family.name}.
            {first ? ` ${t('build.routeStarts', { stage: first })}` : ''}
          </Notice>
          <div>
            <p className="text-sm font-semibold uppercase tracking-wide text-ink-soft">{t('build.newSerial')}</p>
            <p className="font-mono text-[3.25rem] font-semibold leading-tight tracking-wider">{unit.serial}</p>
          </div>
          <div>
            <h3 className="text-sm font-semibold uppercase tracking-wide text-ink-soft">{t('build.wentIn')}</h3>
            <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-5 gap-y-1">
              {parts.map((p) => (
                <Fragment key={p.label}>
                  <dt>{p.label}</dt>
                  <dd className="font-mono font-semibold">{p.serial}</dd>
                </Fragment>
              ))}
              <dt>{t('build.lots')}</dt>
              <dd>{body.lots.length}</dd>
            </dl>
          </div>
          <div className="flex flex-wrap gap-2">
            {canPrint && (
              <ButtonLink to={labelsHref([unit.serial])} variant="primary" size="lg" icon="print">
                {t('build.printLabel')}
              </ButtonLink>
            )}
            <ButtonLink to={stationHref(unit.serial)} size="lg" icon="arrowRight">
              {t('build.recordAssembly')}
            </ButtonLink>
            <ButtonLink to={itemHref(unit.serial)} size="lg" variant="quiet">
              {t('build.open', { serial: unit.serial })}
            </ButtonLink>
            <Button size="lg" onClick={onNext}>
              {t('build.another')}
            </Button>
          </div>
        </div>
      </CardBody>
    </Card>
  );
}

export function BuildPage() {
  const me = useSignedIn();
  const [built, setBuilt] = useState<Built | null>(null);
  const [sheet, setSheet] = useState(0);
  const [mode, setMode] = useState<'build' | 'replace'>('build');
  useT();
  if (!me) return null;
  return (
    // the build bench is worked standing at a tablet, whoever signs in: large targets throughout
    <div data-density="floor" className="mx-auto max-w-[72rem]">
      <PageHeader title={t('build.title')} description={t('build.intro')} />
      <div role="group" aria-label={t('build.whatToDo')} className="mb-5 flex flex-wrap gap-2">
        {(
          [
            ['build', t('build.modeBuild')],
            ['replace', t('build.modeReplace')],
          ] as const
        ).map(([m, label]) => (
          <Button
            key={m}
            variant={mode === m ? 'primary' : 'secondary'}
            aria-pressed={mode === m}
            onClick={() => setMode(m)}
          >
            {label}
          </Button>
        ))}
      </div>
      {mode === 'replace' ? (
        <ReplacePart />
      ) : built ? (
        <BuildDone
          built={built}
          canPrint={me.can('labels.print')}
          onNext={() => {
            setBuilt(null);
            setSheet((n) => n + 1);
          }}
        />
      ) : (
        <BuildForm
          key={sheet}
          onBuilt={(unit, body) => {
            setBuilt({ unit, body });
            window.scrollTo({ top: 0 });
          }}
        />
      )}
    </div>
  );
}
