import type { QueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, type LoaderFunctionArgs } from 'react-router';
import { parseSerial } from '../../../shared/domain/serial';
import { useSignedIn } from '../../api/auth/me';
import { coreQueryOptions, useCore } from '../../api/cores/core';
import type { CoreDetail } from '../../api/cores/types';
import { itemQueryOptions, useItem } from '../../api/items/item';
import type { ItemJson } from '../../api/items/types';
import { ItemSummary } from '../../components/item-summary';
import { PageHeader } from '../../components/page-header';
import { ScanBox } from '../../components/scan-box';
import { Button, ButtonLink } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Notice } from '../../components/ui/notice';
import { partName } from '../../lib/item-status';
import { itemHref, labelsHref, serialHref } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { useUrlFilter } from '../../lib/use-url-filter';
import { teardownWords } from './screen-words';
import { TeardownForm } from './teardown-form';
import { t, useT } from '../../lib/i18n';
import { label } from '../../lib/server-messages';

export const teardownLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    const [me] = await Promise.all([requirePermission(queryClient, request, 'teardown.record'), teardownWords()]);
    const parsed = parseSerial(new URL(request.url).searchParams.get('serial') ?? '');
    // a core that cannot be found is said on the page, next to the scan box, not as an error page
    if (parsed.ok) {
      await Promise.all([
        queryClient.prefetchQuery(itemQueryOptions(parsed.serial)),
        // what intake recorded (missing parts, damage), for those whose role may read it
        me.can('intake.read') ? queryClient.prefetchQuery(coreQueryOptions(parsed.serial)) : undefined,
      ]);
    }
    return null;
  };

function NotTearable({ item, canIntake }: { item: ItemJson; canIntake: boolean }) {
  const link = (
    <Link to={serialHref(item.serial, item.kind, canIntake)} className="font-mono text-accent underline">
      {item.serial}
    </Link>
  );
  if (item.kind !== 'core') {
    return (
      <Notice tone="info" title={t('teardown.notCore')}>
        {link} {t('teardown.notCoreBody', { kind: label(item.kindLabel).toLowerCase() })}
      </Notice>
    );
  }
  if (item.status === 'rejected') {
    return (
      <Notice tone="bad" title={t('teardown.rejected')}>
        {link} {t('teardown.rejectedBody')}
      </Notice>
    );
  }
  return (
    <Notice tone="info" title={t('teardown.already')}>
      {link} {t('teardown.alreadyBody')}
    </Notice>
  );
}

function TeardownDone({ core, onNext }: { core: CoreDetail; onNext: () => void }) {
  const kept = core.teardown?.kept ?? [];
  return (
    <Card labelledBy="done-heading">
      <CardHeader
        id="done-heading"
        title={t('teardown.doneTitle')}
        description={t('teardown.doneIntro', { serial: core.serial })}
      />
      <CardBody>
        <div className="flex flex-col gap-4">
          <Notice tone="ok" live="status" title={t('teardown.serialized', { count: kept.length })}>
            {core.teardown && core.teardown.scrapped.length > 0
              ? t('teardown.scrapped', { count: core.teardown.scrapped.length })
              : t('teardown.nothingScrapped')}
          </Notice>
          {kept.length > 0 && (
            <ul className="divide-y divide-rule">
              {core.parts.map((p) => (
                <li key={p.serial} className="flex flex-wrap items-baseline gap-x-5 py-2.5">
                  <Link
                    to={itemHref(p.serial)}
                    className="font-mono text-2xl font-semibold tracking-wide text-accent underline-offset-4 hover:underline"
                  >
                    {p.serial}
                  </Link>
                  <span className="text-lg">
                    {partName(label(p.kindLabel), p.positionLabel && label(p.positionLabel))}
                  </span>
                </li>
              ))}
            </ul>
          )}
          <div className="flex flex-wrap gap-2">
            {kept.length > 0 && (
              <ButtonLink to={labelsHref(kept.map((k) => k.serial))} variant="primary" size="lg" icon="print">
                {t('teardown.printLabels')}
              </ButtonLink>
            )}
            <Button size="lg" onClick={onNext}>
              {t('teardown.another')}
            </Button>
          </div>
        </div>
      </CardBody>
    </Card>
  );
}

export function TeardownPage() {
  const me = useSignedIn();
  // re-rendered when the language changes; the parts below read the same words
  useT();
  const { params, set } = useUrlFilter();
  const parsed = parseSerial(params.get('serial') ?? '');
  const serial = parsed.ok ? parsed.serial : null;
  const item = useItem(serial);
  const [done, setDone] = useState<CoreDetail | null>(null);
  const tearable = item.data?.kind === 'core' && item.data.status === 'received';
  const canIntake = me?.can('intake.read') ?? false;
  const core = useCore(serial ?? '', { enabled: tearable && canIntake });
  if (!me) return null;
  const finished = done && done.serial === serial ? done : null;
  // the form waits for the intake record, so its rows start from what intake found missing
  // (the item itself carries the condition too, for those who may not read the whole receipt)
  const conditionReady = !canIntake || core.data !== undefined || core.error !== null;

  return (
    <div className="mx-auto max-w-[60rem]">
      <PageHeader title={t('teardown.title')} description={t('teardown.intro')} />
      <div className="flex flex-col gap-5">
        {!finished && (
          <Card labelledBy="scan-heading">
            <CardHeader id="scan-heading" title={t('teardown.whichCore')} />
            <CardBody>
              <div className="flex flex-col gap-5">
                <ScanBox
                  onItem={(i) => set('serial', i.serial)}
                  preview={false}
                  autoFocus={!serial}
                  initial={params.get('serial') ?? ''}
                />
                {item.data && (
                  <div className="border-t border-rule pt-4">
                    <ItemSummary item={item.data} />
                  </div>
                )}
              </div>
            </CardBody>
          </Card>
        )}
        {item.error && !finished && (
          <Notice tone="bad" live="alert">
            {item.error.message}
          </Notice>
        )}
        {finished ? (
          <TeardownDone core={finished} onNext={() => set('serial', '')} />
        ) : (
          item.data &&
          (tearable ? (
            conditionReady ? (
              <TeardownForm
                key={item.data.serial}
                item={item.data}
                condition={
                  core.data?.receipt.condition ??
                  (item.data.intakeCondition as CoreDetail['receipt']['condition'] | null) ??
                  (canIntake ? 'not-loaded' : 'not-allowed')
                }
                onDone={setDone}
              />
            ) : (
              <p className="text-ink-soft">{t('teardown.loadingIntake')}</p>
            )
          ) : (
            <NotTearable item={item.data} canIntake={me.can('intake.read')} />
          ))
        )}
      </div>
    </div>
  );
}
