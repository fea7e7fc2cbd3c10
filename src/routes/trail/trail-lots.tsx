import { Link } from 'react-router';
import { LOT_KIND_LABELS, type LotKind } from '../../../shared/schemas/build';
import type { TrailLot } from '../../../shared/schemas/trail';
import { Card, CardHeader } from '../../components/ui/card';
import { EmptyRow, Table, TBody, TD, TH, THead, TR } from '../../components/ui/table';
import { lotHref } from '../../lib/paths';

export const lotKindLabel = (kind: string) => LOT_KIND_LABELS[kind as LotKind] ?? kind.replace(/_/g, ' ');

const oversizeOf = (l: TrailLot) => {
  const v = l.attributes.oversizeIn;
  return typeof v === 'number' ? (v === 0 ? 'standard' : `+${v.toFixed(4).replace(/0$/, '')} in oversize`) : null;
};

/** The purchased lots that went into the unit; each lot code opens every unit that lot went into. */
export function TrailLots({ lots }: { lots: TrailLot[] }) {
  return (
    <Card labelledBy="lots-heading">
      <CardHeader id="lots-heading" title="Purchased lots" />
      <div className="overflow-x-auto">
        <Table caption="Purchased lots">
          <THead>
            <tr>
              <TH>Part</TH>
              <TH>Lot code</TH>
              <TH align="right">Qty</TH>
            </tr>
          </THead>
          <TBody>
            {lots.length === 0 && <EmptyRow colSpan={3}>No purchased lots are recorded against it.</EmptyRow>}
            {lots.map((l) => {
              const over = oversizeOf(l);
              return (
                <TR key={`${l.kind}/${l.lotCode}/${l.partNumber}`}>
                  <TD>
                    <span className="block font-medium">{lotKindLabel(l.kind)}</span>
                    <span className="block text-sm text-ink-soft">{l.supplier}</span>
                  </TD>
                  <TD>
                    <Link
                      to={lotHref(l.lotCode)}
                      className="font-mono font-semibold text-accent underline-offset-4 hover:underline"
                    >
                      {l.lotCode}
                    </Link>
                    <span className="block font-mono text-sm text-ink-soft">
                      {l.partNumber}
                      {over ? ` · ${over}` : ''}
                    </span>
                  </TD>
                  <TD align="right" mono>
                    {l.quantity}
                  </TD>
                </TR>
              );
            })}
          </TBody>
        </Table>
      </div>
    </Card>
  );
}
