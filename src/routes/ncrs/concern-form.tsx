import { Link } from 'react-router';
import { z } from 'zod';
import { raiseNcrBody, type RaiseNcrBody } from '../../../shared/schemas/ncr';
import { useDefectCodes } from '../../api/defect-codes/defect-codes';
import type { ItemJson } from '../../api/items/types';
import { useRaiseNcr } from '../../api/ncrs/raise-ncr';
import type { NcrDetail } from '../../api/ncrs/types';
import { useSuppliers } from '../../api/reference/suppliers';
import { Form, SubmitButton } from '../../components/form';
import { SelectField, TextAreaField, TextField } from '../../components/form-fields';
import { PhotoField } from '../../components/photo-field';
import { Button, ButtonLink } from '../../components/ui/button';
import { Card, CardBody, CardHeader } from '../../components/ui/card';
import { Icon } from '../../components/ui/icon';
import { Notice } from '../../components/ui/notice';
import { itemHref, lotHref, ncrHref } from '../../lib/paths';
import { activeDefectOptions } from './defect-options';
import { SeverityField } from './severity-field';

/** A concern is about a part already found by its serial, or a purchased lot named in the form. */
export type ConcernAbout = { kind: 'part'; item: ItemJson } | { kind: 'lot' };

// the shared body takes a serial or a lot code; on the lot form the lot code is the one asked for
const lotConcernBody = raiseNcrBody.extend({
  lotCode: z.string('Enter the lot code.').trim().toUpperCase().min(1, 'Enter the lot code.').max(60),
});

function LotFields() {
  const suppliers = useSuppliers();
  const options = (suppliers.data ?? []).map((s) => ({ value: String(s.id), label: s.name }));
  return (
    <div className="grid grid-cols-1 items-start gap-4 md:grid-cols-2">
      <TextField
        name="lotCode"
        label="Lot code"
        mono
        autoFocus
        hint="As printed on the box or the supplier’s label, e.g. L13-UFQ."
      />
      <SelectField
        name="supplierId"
        label="Supplier (optional)"
        options={options}
        placeholder="Any supplier"
        numeric
        hint="Only when two suppliers use the same lot code: Coretrail asks for it if so."
      />
      <TextField
        name="partNumber"
        label="Part number (optional)"
        mono
        optional
        hint="Only when the supplier uses the lot code on more than one part number: Coretrail asks for it if so."
      />
    </div>
  );
}

function WhatIsWrong({ canPhoto, about }: { canPhoto: boolean; about: ConcernAbout['kind'] }) {
  const defects = useDefectCodes();
  return (
    <>
      <TextAreaField
        name="description"
        label="What did you see?"
        hint={
          about === 'lot'
            ? 'Which parts of the lot, and what you saw or measured. At least 10 characters.'
            : 'Where on the part, and what you saw or measured. At least 10 characters.'
        }
      />
      <SeverityField name="severity" />
      <SelectField
        name="defectCode"
        label="Defect code"
        options={activeDefectOptions(defects.data ?? [])}
        placeholder="Choose the closest…"
      />
      <TextAreaField
        name="containment"
        label="Containment (optional)"
        hint={
          about === 'lot'
            ? 'What you did to keep it from being used: tagged the boxes, moved them to the hold rack, told the build bench.'
            : 'What you did to keep it from going on: tagged it, moved it to the hold rack, told the next station.'
        }
        optional
      />
      {canPhoto && <PhotoField name="photoIds" label="Photos (optional)" max={10} />}
      <SubmitButton size="lg" wide>
        Raise concern
      </SubmitButton>
    </>
  );
}

export function ConcernForm({
  about,
  canPhoto,
  onRaised,
}: {
  about: ConcernAbout;
  canPhoto: boolean;
  onRaised: (n: NcrDetail) => void;
}) {
  const raise = useRaiseNcr();
  const submit = async (body: RaiseNcrBody) => onRaised(await raise.mutateAsync(body));
  const blank = { description: '', containment: '', photoIds: [] };

  if (about.kind === 'lot') {
    return (
      <Card labelledBy="concern-heading">
        <CardHeader
          id="concern-heading"
          title="Which lot, and what is wrong"
          description="Once you raise the concern, none of the lot can go into a unit until a quality engineer decides it."
        />
        <CardBody>
          <Form
            schema={lotConcernBody}
            defaultValues={{ ...blank, lotCode: '', supplierId: undefined }}
            onSubmit={submit}
          >
            <LotFields />
            <WhatIsWrong canPhoto={canPhoto} about="lot" />
          </Form>
        </CardBody>
      </Card>
    );
  }
  return (
    <Card labelledBy="concern-heading">
      <CardHeader
        id="concern-heading"
        title="What is wrong"
        description={`About ${about.item.serial}. It goes on hold as soon as you raise the concern.`}
      />
      <CardBody>
        <Form schema={raiseNcrBody} defaultValues={{ ...blank, serial: about.item.serial }} onSubmit={submit}>
          <WhatIsWrong canPhoto={canPhoto} about="part" />
        </Form>
      </CardBody>
    </Card>
  );
}

function HeldNotice({ ncr }: { ncr: NcrDetail }) {
  if (ncr.lot) {
    return (
      <Notice tone="hold" title={`Lot ${ncr.lot.lotCode} cannot go into a unit`}>
        Not until a quality engineer decides the NCR. Keep what is left of the lot tagged and apart.
      </Notice>
    );
  }
  if (ncr.item?.status === 'on_hold') {
    return (
      <Notice tone="hold" title={`${ncr.serial} is on hold`}>
        It stays where it is until a quality engineer decides the NCR. Keep it tagged and apart.
      </Notice>
    );
  }
  return (
    <Notice tone="info" title={`${ncr.serial} was not put on hold`}>
      It has already left the plant, so there is nothing to hold; quality will follow it up.
    </Notice>
  );
}

export function Raised({
  ncr,
  canRead,
  canOpenLot,
  onAnother,
}: {
  ncr: NcrDetail;
  canRead: boolean;
  canOpenLot: boolean;
  onAnother: () => void;
}) {
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
          <HeldNotice ncr={ncr} />
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
          {ncr.lot && canOpenLot && (
            <ButtonLink to={lotHref(ncr.lot.lotCode)} size="lg">
              Open the lot
            </ButtonLink>
          )}
        </div>
      </CardBody>
    </Card>
  );
}
