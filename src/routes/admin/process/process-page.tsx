import type { QueryClient } from '@tanstack/react-query';
import { createColumnHelper, getCoreRowModel, useReactTable, type ColumnDef } from '@tanstack/react-table';
import { useMemo, useState } from 'react';
import type { LoaderFunctionArgs } from 'react-router';
import type { CharacteristicJson, PartKindJson, ProcessStageJson } from '../../../../shared/schemas/process';
import {
  characteristicsQueryOptions,
  partKindsQueryOptions,
  processStagesQueryOptions,
  useCharacteristics,
  usePartKinds,
  useProcessStages,
} from '../../../api/process/queries';
import { useRetireCharacteristic, useUpdateStage } from '../../../api/process/mutations';
import { DataTable } from '../../../components/data-table';
import { PageHeader } from '../../../components/page-header';
import { Badge } from '../../../components/ui/badge';
import { Button } from '../../../components/ui/button';
import { Card, CardHeader } from '../../../components/ui/card';
import { Notice } from '../../../components/ui/notice';
import { requirePermission } from '../../../lib/session';
import { AddCharacteristicDialog, AddPartKindDialog, AddStageDialog } from './process-dialogs';

export const processLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, 'process.edit');
    await Promise.all([
      queryClient.ensureQueryData(partKindsQueryOptions()),
      queryClient.ensureQueryData(processStagesQueryOptions()),
      queryClient.ensureQueryData(characteristicsQueryOptions(null)),
    ]);
    return null;
  };

function Table<T>({
  rows,
  columns,
  caption,
  empty,
  muted,
}: {
  rows: T[];
  columns: ColumnDef<T, never>[];
  caption: string;
  empty: string;
  muted?: (row: T) => boolean;
}) {
  // eslint-disable-next-line react-hooks/incompatible-library -- the table instance is rebuilt each render by design
  const table = useReactTable({ data: rows, columns, getCoreRowModel: getCoreRowModel() });
  return <DataTable table={table} caption={caption} empty={empty} muted={muted} />;
}

const kindCol = createColumnHelper<PartKindJson>();
const stageCol = createColumnHelper<ProcessStageJson>();
const charCol = createColumnHelper<CharacteristicJson>();

type Open = 'kind' | 'stage' | 'characteristic' | null;

export function ProcessPage() {
  const kinds = usePartKinds();
  const stages = useProcessStages();
  const characteristics = useCharacteristics(null);
  const updateStage = useUpdateStage();
  const retireChar = useRetireCharacteristic();
  const [open, setOpen] = useState<Open>(null);
  const close = () => setOpen(null);
  const kindName = useMemo(() => new Map((kinds.data ?? []).map((k) => [k.code, k.name])), [kinds.data]);

  const kindColumns = useMemo(
    () =>
      [
        kindCol.accessor('name', { header: 'Part kind' }),
        kindCol.accessor('code', { header: 'Code', meta: { mono: true } }),
        kindCol.accessor('serialized', {
          header: 'Serial',
          cell: (c) => (c.getValue() ? 'Each part serialized' : 'Counted, not serialized'),
        }),
        kindCol.accessor('retired', {
          header: 'In use',
          cell: (c) =>
            c.getValue() ? (
              <Badge tone="off">Retired</Badge>
            ) : c.row.original.builtIn ? (
              <Badge tone="neutral">Built in</Badge>
            ) : (
              <Badge tone="ok">In use</Badge>
            ),
        }),
      ] as ColumnDef<PartKindJson, never>[],
    [],
  );

  const stageColumns = useMemo(
    () =>
      [
        stageCol.accessor('name', {
          header: 'Stage',
          cell: (c) => (
            <span className="flex flex-col leading-snug">
              <span>{c.getValue()}</span>
              <span className="font-mono text-sm text-ink-faint">{c.row.original.code}</span>
              {c.row.original.runTest && (
                <span className="mt-1">
                  <Badge tone="neutral">Run test: release requires it passed</Badge>
                </span>
              )}
            </span>
          ),
        }),
        stageCol.accessor('partKind', { header: 'Part', cell: (c) => kindName.get(c.getValue()) ?? c.getValue() }),
        stageCol.accessor('caution', {
          header: 'Caution',
          cell: (c) =>
            c.row.original.hazardous ? (
              <span className="flex flex-col gap-1">
                <Badge tone="hold">Hazard</Badge>
                <span className="text-sm">{c.getValue()}</span>
              </span>
            ) : (
              <span className="text-ink-soft">—</span>
            ),
        }),
        stageCol.accessor('stations', {
          header: 'Stations',
          cell: (c) => c.row.original.stations.join(', ') || <span className="text-ink-soft">None</span>,
        }),
        stageCol.display({
          id: 'actions',
          header: () => <span className="sr-only">Actions</span>,
          meta: { nowrap: true },
          cell: (c) =>
            c.row.original.retired ? (
              <Badge tone="off">Retired</Badge>
            ) : (
              <span className="flex flex-wrap gap-2">
                {c.row.original.partKind === 'long_block' && (
                  <Button
                    size="sm"
                    aria-label={`${c.row.original.runTest ? 'Unmark' : 'Mark'} stage ${c.row.original.code} as the run test`}
                    onClick={() => updateStage.mutate({ id: c.row.original.id, runTest: !c.row.original.runTest })}
                  >
                    {c.row.original.runTest ? 'Not the run test' : 'Mark as run test'}
                  </Button>
                )}
                <Button
                  size="sm"
                  aria-label={`Retire stage ${c.row.original.code}`}
                  onClick={() => updateStage.mutate({ id: c.row.original.id, retired: true })}
                >
                  Retire
                </Button>
              </span>
            ),
        }),
      ] as ColumnDef<ProcessStageJson, never>[],
    [kindName, updateStage],
  );

  const charColumns = useMemo(
    () =>
      [
        charCol.accessor('name', {
          header: 'Characteristic',
          cell: (c) => (
            <span className="flex flex-col leading-snug">
              <span>
                {c.getValue()} {c.row.original.critical && <Badge tone="accent">Critical</Badge>}
              </span>
              <span className="font-mono text-sm text-ink-faint">
                {c.row.original.stage} / {c.row.original.code}
              </span>
            </span>
          ),
        }),
        charCol.accessor('kind', {
          header: 'Kind',
          cell: (c) =>
            c.getValue() === 'attribute'
              ? 'Pass / fail'
              : `Measured in ${c.row.original.unit ?? '—'} to ${c.row.original.resolution ?? '—'}`,
        }),
        charCol.accessor('positions', { header: 'Taken at', cell: (c) => c.row.original.positions.per }),
        charCol.accessor('gaugeKinds', {
          header: 'Gauges',
          cell: (c) => c.row.original.gaugeKinds.join(', ') || <span className="text-ink-soft">Any suitable</span>,
        }),
        charCol.display({
          id: 'actions',
          header: () => <span className="sr-only">Actions</span>,
          meta: { nowrap: true },
          cell: (c) =>
            c.row.original.retired ? (
              <Badge tone="off">Retired</Badge>
            ) : (
              <Button
                size="sm"
                aria-label={`Retire ${c.row.original.stage} ${c.row.original.code}`}
                onClick={() =>
                  retireChar.mutate({ id: c.row.original.id, reason: 'Retired from the process definition page' })
                }
              >
                Retire
              </Button>
            ),
        }),
      ] as ColumnDef<CharacteristicJson, never>[],
    [retireChar],
  );

  const error = kinds.error ?? stages.error ?? characteristics.error ?? updateStage.error ?? retireChar.error;
  return (
    <>
      <PageHeader
        title="Process definition"
        description="The part kinds, stages and characteristics the plant works with. Nothing in use is deleted: it is retired, and every change is in the audit log."
      />
      {error && (
        <div className="mb-4">
          <Notice tone="bad" live="alert">
            {error.message}
          </Notice>
        </div>
      )}
      <div className="flex flex-col gap-6">
        <Card labelledBy="kinds-heading">
          <CardHeader
            id="kinds-heading"
            title="Part kinds"
            actions={<Button onClick={() => setOpen('kind')}>Add part kind</Button>}
          />
          <Table rows={kinds.data ?? []} columns={kindColumns} caption="Part kinds" empty="No part kinds." />
        </Card>
        <Card labelledBy="stages-heading">
          <CardHeader
            id="stages-heading"
            title="Stages"
            description="Work that can hurt someone shows its caution at the station."
            actions={<Button onClick={() => setOpen('stage')}>Add stage</Button>}
          />
          <Table
            rows={stages.data ?? []}
            columns={stageColumns}
            caption="Stages"
            empty="No stages yet."
            muted={(s) => s.retired}
          />
        </Card>
        <Card labelledBy="chars-heading">
          <CardHeader
            id="chars-heading"
            title="Characteristics"
            description="What each stage measures or judges. Limits are set per family in the spec book."
            actions={<Button onClick={() => setOpen('characteristic')}>Add characteristic</Button>}
          />
          <Table
            rows={characteristics.data ?? []}
            columns={charColumns}
            caption="Characteristics"
            empty="No characteristics yet."
            muted={(c) => c.retired}
          />
        </Card>
      </div>
      {open === 'kind' && <AddPartKindDialog onClose={close} />}
      {open === 'stage' && <AddStageDialog kinds={kinds.data ?? []} onClose={close} />}
      {open === 'characteristic' && <AddCharacteristicDialog stages={stages.data ?? []} onClose={close} />}
    </>
  );
}
