'use client';

import Link from 'next/link';
import { DataTable, type Column } from '@/components/ui/data-table';
import { EmptyState } from '@/components/ui/empty-state';
import { formatBytes, formatDate } from '@/components/ui/format';
import type { DatasetRow } from '@/lib/core/api-types';

const columns: Column<DatasetRow>[] = [
  { key: 'name', header: 'Name', cell: (r) => <Link href={`/app/datasets/${r.id}`} className="font-medium text-accent-800 underline-offset-2 hover:underline">{r.name}</Link>, sortValue: (r) => r.name.toLowerCase() },
  { key: 'unit', header: 'Unit', cell: (r) => r.unit || '—' },
  { key: 'count', header: 'Values', cell: (r) => r.rowCount, numeric: true, sortValue: (r) => r.rowCount },
  { key: 'uses', header: 'Used by', cell: (r) => (r.useCount === 1 ? '1 model' : `${r.useCount} models`), numeric: true, sortValue: (r) => r.useCount },
  { key: 'file', header: 'File', cell: (r) => <span title={`sha256 ${r.hash}`}>{r.fileName} · {formatBytes(r.sizeBytes)}</span>, hideBelow: 'md' },
  { key: 'by', header: 'Uploaded', cell: (r) => `${formatDate(r.createdAt)}${r.uploadedByName ? ` by ${r.uploadedByName}` : ''}`, sortValue: (r) => r.createdAt, hideBelow: 'sm' },
];

export function DatasetLibrary({ rows }: { rows: DatasetRow[] }) {
  return (
    <DataTable
      caption="Datasets of measured data"
      columns={columns}
      rows={rows}
      rowKey={(r) => r.id}
      initialSort={{ key: 'by', dir: 'desc' }}
      empty={<EmptyState title="No datasets yet">Upload a CSV of measurements (or paste a column) to fit a law to it and use it in a model.</EmptyState>}
    />
  );
}
