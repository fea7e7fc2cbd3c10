import type { QueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, type LoaderFunctionArgs } from 'react-router';
import { parseSerial } from '../../../shared/domain/serial';
import { raiseNcrBody, type RaiseNcrBody } from '../../../shared/schemas/ncr';
import { useSignedIn } from '../../api/auth/me';
import { itemQueryOptions, useItem } from '../../api/items/item';
import type { ItemJson } from '../../api/items/types';
import { DEFECT_CODES } from '../../api/ncrs/defect-codes';
import { useRaiseNcr } from '../../api/ncrs/raise-ncr';
import type { NcrDetail } from '../../api/ncrs/types';
import { Form, SubmitButton } from '../../components/form';
import { SelectField, TextAreaField } from '../../components/form-fields';
import { ItemSummary } from '../../components/item-summary';
import { PageHeader } from '../../components/page-header';
import { PhotoField } from '../../components/photo-field';
import { ScanBox } from '../../components/scan-box';
import { Button, ButtonLink } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Icon } from '../../components/ui/icon';
import { Notice } from '../../components/ui/notice';
import { itemHref, ncrHref } from '../../lib/paths';
import { requirePermission } from '../../lib/session';
import { useUrlFilter } from '../../lib/use-url-filter';
import { SeverityField } from './severity-field';

export const raiseConcernLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'ncr.raise');
    const parsed = parseSerial(new URL(request.url).searchParams.get('serial') ?? '');
    // a serial that cannot be found is said beside the scan box, not as an error page
    if (parsed.ok) await queryClient.prefetchQuery(itemQueryOptions(parsed.serial));
    return null;
  };

const defectOptions = DEFECT_CODES.map((d) => ({ value: d.code, label: `${d.code} — ${d.description}` }));

function ConcernForm({
  item,
  canPhoto,
  onRaised,
}: {
  item: ItemJson;
  canPhoto: boolean;
  onRaised: (n: NcrDetail) => void;
}) {
  const raise = useRaiseNcr();
  return (
    <Card labelledBy="concern-heading">
      <CardHeader
        id="concern-heading"
        title="What is wrong"
        description={`About ${item.serial}. It goes on hold as soon as you raise the concern.`}
      />
      <CardBody>
        <Form
          schema={raiseNcrBody}
          defaultValues={{ serial: item.serial, description: '', containment: '', photoIds: [] }}
          onSubmit={async (body: RaiseNcrBody) => onRaised(await raise.mutateAsync(body))}
        >
          <TextAreaField
            name="description"
            label="What did you see?"
            hint="Where on the part, and what you saw or measured. At least 10 characters."
          />
          <SeverityField name="severity" />
          <SelectField
            name="defectCode"
            label="Defect code"
            options={defectOptions}
            placeholder="Choose the closest…"
          />
          <TextAreaField
            name="containment"
            label="Containment (optional)"
            hint="What you did to keep it from going on: tagged it, moved it to the hold rack, told the next station."
            optional
          />
          {canPhoto && <PhotoField name="photoIds" label="Photos (optional)" max={10} />}
          <SubmitButton size="lg" wide>
            Raise concern
          </SubmitButton>
        </Form>
      </CardBody>
    </Card>
  );
}

function Raised({ ncr, canRead, onAnother }: { ncr: NcrDetail; canRead: boolean; onAnother: () => void }) {
  const held = ncr.item?.status === 'on_hold';
  return (
    <Card labelledBy="raised-heading">
      <CardBody>
        <div role="status" className="flex flex-col gap-3">
          <h2 id="raised-heading" className="flex items-center gap-2.5 text-2xl font-semibold">
            <Icon name="ok" size={28} className="text-ok" />
            Concern raised as{' '}
            {canRead ? (
              <Link to={ncrHref(ncr.number)} className="font-mono text-accent underline underline-offset-4">
                {ncr.number}
              </Link>
            ) : (
              <span className="font-mono">{ncr.number}</span>
            )}
          </h2>
          {held ? (
            <Notice tone="hold" title={`${ncr.serial} is on hold`}>
              It stays where it is until a quality engineer decides the NCR. Keep it tagged and apart.
            </Notice>
          ) : (
            <Notice tone="info" title={`${ncr.serial} was not put on hold`}>
              It has already left the plant, so there is nothing to hold; quality will follow it up.
            </Notice>
          )}
        </div>
        <div className="mt-5 flex flex-wrap gap-2">
          <Button variant="primary" size="lg" onClick={onAnother}>
            Raise another concern
          </Button>
          {ncr.serial && (
            <ButtonLink to={itemHref(ncr.serial)} size="lg">
              Open the part
            </ButtonLink>
          )}
        </div>
      </CardBody>
    </Card>
  );
}

export function RaiseConcernPage() {
  const me = useSignedIn();
  const { params, set } = useUrlFilter();
  const parsed = parseSerial(params.get('serial') ?? '');
  const serial = parsed.ok ? parsed.serial : null;
  const item = useItem(serial);
  const [raised, setRaised] = useState<NcrDetail | null>(null);
  if (!me) return null;
  const done = raised && raised.serial === serial ? raised : null;

  return (
    // raised from the floor on a tablet as often as from a desk: the large targets either way
    <div data-density="floor" className="mx-auto max-w-[52rem]">
      <PageHeader
        title="Raise a concern"
        description="Seen something wrong with a part? Scan it and say what you saw. It goes on hold until a quality engineer decides what happens to it."
      />
      <div className="flex flex-col gap-5">
        {done ? (
          <Raised
            ncr={done}
            canRead={me.can('ncr.read')}
            onAnother={() => {
              setRaised(null);
              set('serial', '');
            }}
          />
        ) : (
          <>
            <Card labelledBy="part-heading">
              <CardHeader id="part-heading" title="Which part" />
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
            {item.error && (
              <Notice tone="bad" live="alert">
                {item.error.message}
              </Notice>
            )}
            {item.data &&
              (item.data.status === 'scrapped' ? (
                <Notice tone="info" title="Already scrapped">
                  {item.data.serial} has been scrapped: there is nothing left to hold.
                </Notice>
              ) : (
                <ConcernForm
                  key={item.data.serial}
                  item={item.data}
                  canPhoto={me.can('attachments.upload')}
                  onRaised={setRaised}
                />
              ))}
          </>
        )}
      </div>
    </div>
  );
}
