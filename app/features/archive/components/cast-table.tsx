import { Link } from 'react-router-dom';
import type { CastListItem } from '#shared/schemas/archive.ts';
import { Table, Td, Th, Thead, Tr } from '../../../components/ui/table.tsx';
import { formatDate, formatDateTime } from '../../../lib/format.ts';
import { paths } from '../../../lib/paths.ts';
import { CastStatusBadge, CastThumbnail, castTitle, ConditionBadge } from './cast-status.tsx';

interface CastTableProps {
  casts: readonly CastListItem[];
  caption: string;
  captionHidden?: boolean;
  busy?: boolean;
  /** Leave the performer out, on a page that is already about one performer. */
  showPerformer?: boolean;
  testId?: string;
}

/** Casts as rows: photo, label, what and whose, where it is now, status and condition. */
export function CastTable({ casts, caption, captionHidden = false, busy = false, showPerformer = true, testId = 'casts-table' }: CastTableProps) {
  return (
    <Table caption={caption} captionHidden={captionHidden} busy={busy} testId={testId}>
      <Thead>
        <tr>
          <Th>
            <span className="sr-only">Photo</span>
          </Th>
          <Th>Cast</Th>
          <Th>Where it is</Th>
          <Th>Status</Th>
        </tr>
      </Thead>
      <tbody>
        {casts.map((c) => (
          <Tr key={c.id}>
            <Td className="w-20">
              <CastThumbnail url={c.thumbnailUrl} />
            </Td>
            <Td>
              <Link to={paths.cast.href(c.id)} className="inline-flex min-h-11 flex-col justify-center font-semibold" data-testid="cast-link">
                <span>{castTitle(c)}</span>
                <span className="font-mono text-sm font-normal text-ink-700">{c.labelCode}</span>
              </Link>
              <span className="block text-sm text-ink-700">
                {showPerformer ? `${c.performerName} · ` : ''}
                {c.productionName} · made {formatDate(c.madeOn)}
              </span>
            </Td>
            <Td className="max-w-72 break-words">{c.where}</Td>
            <Td>
              <span className="flex flex-col items-start gap-1">
                <CastStatusBadge status={c.status} overdue={c.overdue} />
                {c.dueBackAt ? <span className="text-sm text-ink-700">Due back {formatDateTime(c.dueBackAt)}</span> : null}
                <ConditionBadge grade={c.condition} />
              </span>
            </Td>
          </Tr>
        ))}
      </tbody>
    </Table>
  );
}
